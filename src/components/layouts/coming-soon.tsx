import { Panel } from '../ui/card';
import { PageHeader } from './app-layout';

/** Holds a route's place until its screen is built. */
export function ComingSoon({ title, description }: { title: string; description: string }) {
  return (
    <>
      <PageHeader title={title} description={description} />
      <Panel>
        <p className="text-sm text-text-muted">This screen is not built yet.</p>
      </Panel>
    </>
  );
}
