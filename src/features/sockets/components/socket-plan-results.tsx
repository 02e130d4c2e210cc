import { formatLength, type LengthUnit } from '@shared/compute/units';
import type { AcceptSocketPlanPreview } from '@shared/schemas/sockets';
import { AffectedPlansList, InlineConfirm, affectedPlansText } from '@/components/affected-plans-prompt';
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

/** What an accept would write, asked before it is: the new nodes and hops, and any reviewed plans touched. */
function AcceptConfirm({
  preview,
  unit,
  isSaving,
  onConfirm,
  onCancel,
}: {
  preview: AcceptSocketPlanPreview;
  unit: LengthUnit;
  isSaving: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const n = preview.sockets.length;
  const what = `add ${n} socket${n === 1 ? '' : 's'}`;
  return (
    <Alert
      tone={preview.affectedPlans.length ? 'caution' : 'info'}
      title={`Add ${n} socket${n === 1 ? '' : 's'} to the station model (version ${preview.version})?`}
    >
      <table className="mt-1 w-full text-left text-sm" aria-label="Sockets to add">
        <thead>
          <tr className="text-xs text-text-muted">
            <th className="py-0.5 pr-3 font-medium">Key</th>
            <th className="py-0.5 pr-3 font-medium">Label</th>
            <th className="py-0.5 font-medium">Joined to</th>
          </tr>
        </thead>
        <tbody>
          {preview.sockets.map((s) => (
            <tr key={s.key}>
              <td className="py-0.5 pr-3 font-mono font-semibold">{s.key}</td>
              <td className="py-0.5 pr-3">{s.label}</td>
              <td className="py-0.5">
                {s.joinedTo} by a {formatLength(s.hopM, unit)} hop
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {preview.affectedPlans.length > 0 && (
        <>
          <p className="mt-2 font-medium">This change touches reviewed plans.</p>
          <p>{affectedPlansText(what, preview.affectedPlans.length)}</p>
          <AffectedPlansList plans={preview.affectedPlans} />
        </>
      )}
      <InlineConfirm
        label={`Add ${n} socket${n === 1 ? '' : 's'}`}
        isLoading={isSaving}
        onConfirm={onConfirm}
        onCancel={onCancel}
      />
    </Alert>
  );
}

/** The run's sockets, what each serves, the assignments, and the accept of the new ones. */
export function SocketPlanResults({ planner, nodeHref, onReload }: SocketPlanResultsProps) {
  const canSave = useCan('sockets:save');
  const {
    station,
    run,
    plan,
    views,
    rows,
    newCount,
    framed,
    setFramed,
    accept,
    preview,
    accepted,
    conflict,
  } = planner;
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
          {canSave && newCount > 0 && !accepted && !preview.data && (
            <div className="flex items-center gap-3">
              <Button isLoading={preview.isPending || accept.isPending} onClick={planner.previewNew}>
                Accept {newCount} new socket{newCount === 1 ? '' : 's'}…
              </Button>
              <span className="text-xs text-text-muted">
                Shows what would be added to the station model first: each socket named after its bay and
                joined by a hop to the nearest handrail junction or anchor.
              </span>
            </div>
          )}
          {preview.data && (
            <AcceptConfirm
              preview={preview.data}
              unit={run.unit}
              isSaving={accept.isPending}
              onConfirm={planner.acceptNew}
              onCancel={planner.cancelAccept}
            />
          )}
          {canSave && newCount === 0 && (
            <p className="text-sm text-text-muted">Every chosen socket already exists: nothing to add.</p>
          )}
          {conflict && (
            <Alert tone="danger" title="The station changed since this plan was computed">
              <p>
                {(accept.error ?? preview.error)?.message} Reload the station and plan again; nothing was
                saved.
              </p>
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
          {(accept.error ?? preview.error) && !conflict && (
            <Alert tone="danger">
              {apiErrorMessage(accept.error ?? preview.error, 'The sockets could not be saved.')}
            </Alert>
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
                    {s.label} · joined to {s.joinedTo} by a {formatLength(s.hopM, run.unit)} hop
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
