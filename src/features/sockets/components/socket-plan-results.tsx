import { formatLength } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { apiErrorMessage } from '@/lib/api-client';
import { useCan } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { exactnessText } from '../lib/planned-sockets';
import type { SocketPlanner } from '../lib/use-socket-planner';
import { SocketPlanTable } from './socket-plan-table';

interface SocketPlanResultsProps {
  planner: SocketPlanner;
  /** a link to a node on the Station screen */
  nodeHref: (key: string) => string;
  /** reload the station after a refused (stale) accept */
  onReload: () => void;
}

/** The run's sockets, what each serves, the assignments, and the accept of the new ones. */
export function SocketPlanResults({ planner, nodeHref, onReload }: SocketPlanResultsProps) {
  const canSave = useCan('sockets:save');
  const { station, run, plan, views, rows, newCount, framed, setFramed, accept, accepted, conflict } =
    planner;
  if (!run) return null;
  return (
    <section aria-label="Socket plan" className="space-y-4">
      {plan.isPending && <Spinner label="Planning sockets" />}
      {plan.error && (
        <Alert tone="danger">{apiErrorMessage(plan.error, 'The socket plan could not be computed.')}</Alert>
      )}
      {plan.data && (
        <>
          <div className="space-y-1">
            <p className="text-base font-semibold text-text-strong">
              {views.length} socket{views.length === 1 ? '' : 's'} for {run.targets.length} target
              {run.targets.length === 1 ? '' : 's'}: {views.length - newCount} existing, {newCount} new
            </p>
            <p className="text-sm text-text-strong">{exactnessText(plan.data)}.</p>
            <p className="text-xs text-text-muted">
              Work envelope: a sphere of radius {formatLength(station.reach.radiusM, run.unit, 2)} around the
              work point {formatLength(station.reach.standOffM, run.unit, 2)} out along each socket&apos;s
              normal (station reach settings, planning defaults from memory). Computed on station version{' '}
              {run.version}.
            </p>
          </div>
          {plan.data.uncovered.length > 0 && (
            <Alert
              tone="caution"
              title={`${plan.data.uncovered.length} target${plan.data.uncovered.length === 1 ? '' : 's'} out of reach of every candidate`}
            >
              <ul className="list-disc pl-4">
                {plan.data.uncovered.map((i) => (
                  <li key={i}>
                    {run.targets[i].label}: no candidate socket brings it within reach. Add grid candidates or
                    another socket.
                  </li>
                ))}
              </ul>
            </Alert>
          )}
          <ul aria-label="Planned sockets" className="flex flex-wrap gap-2 text-sm">
            {views.map((v) => (
              <li
                key={v.index}
                className="flex items-center gap-2 rounded-md border border-surface-line py-1 pr-1 pl-2"
              >
                <span>
                  <span className="font-mono font-semibold">{v.name}</span>{' '}
                  <span className="text-xs text-text-muted">
                    {v.isNew ? 'new' : 'existing'} · serves{' '}
                    {v.targets.map((t) => run.targets[t].label).join(', ') || 'none'}
                  </span>
                </span>
                <Button
                  size="sm"
                  variant="ghost"
                  aria-pressed={framed === v.index}
                  onClick={() => setFramed(framed === v.index ? null : v.index)}
                >
                  {framed === v.index ? 'Show all' : `Show ${v.name}`}
                </Button>
              </li>
            ))}
          </ul>
          <SocketPlanTable rows={rows} unit={run.unit} />
          {canSave && newCount > 0 && !accepted && (
            <div className="flex items-center gap-3">
              <Button isLoading={accept.isPending} onClick={planner.acceptNew}>
                Accept {newCount} new socket{newCount === 1 ? '' : 's'}
              </Button>
              <span className="text-xs text-text-muted">
                Adds them to the station model, each joined by a hop to the nearest handrail node.
              </span>
            </div>
          )}
          {canSave && newCount === 0 && (
            <p className="text-sm text-text-muted">Every chosen socket already exists: nothing to add.</p>
          )}
          {conflict && (
            <Alert tone="danger" title="The station changed since this plan was computed">
              <p>{accept.error?.message} Reload the station and plan again; nothing was saved.</p>
              <Button
                size="sm"
                variant="secondary"
                className="mt-2"
                onClick={() => {
                  planner.discard();
                  onReload();
                }}
              >
                Reload the station
              </Button>
            </Alert>
          )}
          {accept.error && !conflict && (
            <Alert tone="danger">{apiErrorMessage(accept.error, 'The sockets could not be saved.')}</Alert>
          )}
          {accepted && (
            <Alert
              tone="success"
              title={`Added ${accepted.sockets.length} socket${accepted.sockets.length === 1 ? '' : 's'} (station version ${accepted.version})`}
            >
              <ul className="mt-1 space-y-0.5">
                {accepted.sockets.map((s) => (
                  <li key={s.key}>
                    <a className={cn('font-mono font-semibold underline', focusRing)} href={nodeHref(s.key)}>
                      {s.key}
                    </a>{' '}
                    joined to {s.joinedTo} by a {formatLength(s.hopM, run.unit)} hop
                  </li>
                ))}
              </ul>
            </Alert>
          )}
        </>
      )}
    </section>
  );
}
