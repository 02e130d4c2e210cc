import { PERMISSIONS, ROLE_LABELS, ROLE_PERMISSIONS, ROLE_SUMMARIES } from '@shared/auth/permissions';
import { PageHeader } from '@/components/layouts/app-layout';
import { Badge } from '@/components/ui/badge';
import { EmptyState, Panel } from '@/components/ui/card';
import { useUser } from '@/lib/authorization';

export default function HomeRoute() {
  const { data: user } = useUser();
  if (!user) return null;
  const permissions = ROLE_PERMISSIONS[user.role];

  return (
    <>
      <PageHeader title={`Welcome, ${user.name}`} description={ROLE_SUMMARIES[user.role]} />
      <div className="grid gap-5 lg:grid-cols-3">
        <Panel title="What you can do" className="lg:col-span-1">
          <p className="mb-3 text-sm text-text-muted">
            Signed in as <Badge tone="accent">{ROLE_LABELS[user.role]}</Badge>
          </p>
          <ul className="space-y-2 text-sm" aria-label="Your permissions">
            {permissions.map((permission) => (
              <li key={permission} className="flex gap-2">
                <span aria-hidden="true" className="mt-1.5 size-1.5 shrink-0 rounded-full bg-accent" />
                <span>{PERMISSIONS[permission]}</span>
              </li>
            ))}
          </ul>
        </Panel>
        <div className="grid gap-5 lg:col-span-2">
          <Panel title="Stations">
            <EmptyState>No stations yet.</EmptyState>
          </Panel>
          <Panel title="Plans by status">
            <EmptyState>No plans yet.</EmptyState>
          </Panel>
          <Panel title="Recent activity">
            <EmptyState>Nothing has happened yet.</EmptyState>
          </Panel>
        </div>
      </div>
    </>
  );
}
