import { Link } from 'react-router-dom';
import { PERMISSIONS, ROLE_LABELS, ROLE_PERMISSIONS, ROLE_SUMMARIES } from '@shared/auth/permissions';
import { PLAN_STATUSES, type PlanStatus } from '@shared/schemas/plan';
import { PageHeader } from '@/components/layouts/app-layout';
import { Badge } from '@/components/ui/badge';
import { EmptyState, Panel } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { useUser } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { ActivityList } from '@/features/activity/components/activity-list';
import { usePlans } from '@/features/plans/api/get-plans';
import { PlanStatusBadge, STATUS_LABELS } from '@/features/plans/components/plan-status-badge';
import { useStations } from '@/features/stations/api/get-stations';

const linkClass =
  'rounded-sm font-medium text-accent-strong hover:underline focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent';

function StationsPanel() {
  const { data, isPending, isError } = useStations();
  return (
    <Panel
      title="Stations"
      actions={
        <Link to={paths.stations.getHref()} className={linkClass}>
          All stations
        </Link>
      }
    >
      {isPending ? (
        <Spinner />
      ) : isError ? (
        <EmptyState>The stations could not be loaded.</EmptyState>
      ) : data.length === 0 ? (
        <EmptyState>No stations yet. An engineer can import one from the Stations page.</EmptyState>
      ) : (
        <ul className="divide-y divide-surface-line text-sm">
          {data.map((s) => (
            <li key={s.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2">
              <Link to={paths.station.getHref(s.id)} className={linkClass}>
                {s.name}
              </Link>
              <span className="text-text-muted">
                {s.counts.nodes} nodes · {s.counts.edges} edges · {s.counts.hazards} hazards · version{' '}
                {s.version}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

function PlansPanel() {
  const { data, isPending, isError } = usePlans();
  return (
    <Panel
      title="Plans by status"
      actions={
        <Link to={paths.plans.getHref()} className={linkClass}>
          All plans
        </Link>
      }
    >
      {isPending ? (
        <Spinner />
      ) : isError ? (
        <EmptyState>The plans could not be loaded.</EmptyState>
      ) : data.length === 0 ? (
        <EmptyState>No plans yet. A planner can start one from the Plans page.</EmptyState>
      ) : (
        <div className="grid gap-4 sm:grid-cols-3">
          {PLAN_STATUSES.map((status: PlanStatus) => {
            const plans = data.filter((p) => p.status === status);
            return (
              <section key={status} aria-label={`${STATUS_LABELS[status]} plans`}>
                <h3 className="mb-2 flex items-center gap-2 text-sm font-semibold text-text-strong">
                  <PlanStatusBadge status={status} />
                  <span className="text-text-muted">{plans.length}</span>
                </h3>
                {plans.length === 0 ? (
                  <EmptyState>None.</EmptyState>
                ) : (
                  <ul className="space-y-2 text-sm">
                    {plans.map((p) => (
                      <li key={p.id}>
                        <Link to={paths.plan.getHref(p.id)} className={linkClass}>
                          {p.title}
                        </Link>
                        <div className="text-xs text-text-muted">
                          {p.stationName} · {p.date} · updated {formatDateTime(p.updatedAt)}
                        </div>
                      </li>
                    ))}
                  </ul>
                )}
              </section>
            );
          })}
        </div>
      )}
    </Panel>
  );
}

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
          <StationsPanel />
          <PlansPanel />
          <Panel title="Recent activity">
            <ActivityList />
          </Panel>
        </div>
      </div>
    </>
  );
}
