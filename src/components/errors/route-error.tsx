import { isRouteErrorResponse, useRevalidator, useRouteError } from 'react-router-dom';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { Alert } from '../ui/alert';
import { Button } from '../ui/button';
import { TextLink } from '../ui/text-link';

function describe(error: unknown): { title: string; message: string; notFound: boolean } {
  if (isApiError(error)) {
    if (error.status === 404) return { title: 'Not found', message: error.message, notFound: true };
    if (error.status === 403) return { title: 'Not allowed', message: error.message, notFound: false };
    return { title: 'Something went wrong', message: error.message, notFound: false };
  }
  if (isRouteErrorResponse(error)) {
    const notFound = error.status === 404;
    return {
      title: notFound ? 'Not found' : `Error ${error.status}`,
      message: notFound
        ? 'There is nothing at this address.'
        : error.statusText || 'The page could not be shown.',
      notFound,
    };
  }
  const message =
    error instanceof Error &&
    /dynamically imported module|Importing a module script failed/i.test(error.message)
      ? 'A part of the app could not be loaded, perhaps because it was updated. Reload the page.'
      : 'An unexpected error stopped this page. Retry, and if it persists tell the tool owner.';
  return { title: 'Something went wrong', message, notFound: false };
}

/** The errorElement of every route: says what failed and offers a way on. */
export function RouteError() {
  const error = useRouteError();
  const revalidator = useRevalidator();
  const { title, message, notFound } = describe(error);
  return (
    <div className="mx-auto max-w-xl px-4 py-12">
      <h1 className="mb-4 text-2xl font-semibold text-text-strong">{title}</h1>
      <Alert tone={notFound ? 'info' : 'danger'}>{message}</Alert>
      <div className="mt-6 flex gap-3">
        {!notFound && (
          <Button isLoading={revalidator.state === 'loading'} onClick={() => revalidator.revalidate()}>
            Retry
          </Button>
        )}
        <TextLink to={paths.home.getHref()} className="self-center">
          Go to Home
        </TextLink>
      </div>
    </div>
  );
}
