import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';

export default function NotFoundRoute() {
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <p className="text-sm font-semibold text-accent">404</p>
      <h1 className="mt-2 text-2xl font-semibold text-text-strong">Page not found</h1>
      <p className="mt-3 text-sm text-text-muted">There is nothing at this address. It may have moved.</p>
      <TextLink to={paths.home.getHref()} className="mt-6">
        Go to Home
      </TextLink>
    </main>
  );
}
