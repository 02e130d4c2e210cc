import { formatElapsed, formatGmt, formatMinutes } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import type { RunScreenData } from '../api/get-run';

/** Where the day is heading: projected end and margin against the plan's, nights missed, what to drop. */
export function RunSummary({ view }: { view: RunScreenData }) {
  const startedAt = view.run.startedAt;
  const title = (id: number) => view.tasks.find((t) => t.id === id)?.title ?? `task ${id}`;
  const slip = view.projectedEndSeconds - view.plannedEndSeconds;
  return (
    <div className="space-y-3" data-testid="run-summary">
      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-base xl:text-xl">
        <dt className="text-text-muted">Projected end</dt>
        <dd className="font-mono font-semibold" data-testid="projected-end">
          {formatElapsed(view.projectedEndSeconds)} ({formatGmt(startedAt, view.projectedEndSeconds)} GMT)
        </dd>
        <dt className="text-text-muted">Planned end</dt>
        <dd className="font-mono">
          {formatElapsed(view.plannedEndSeconds)}
          {view.plan.startGmt && ` (${formatGmt(view.plan.startGmt, view.plannedEndSeconds)} GMT planned)`}
        </dd>
        <dt className="text-text-muted">Margin now</dt>
        <dd
          className={
            view.marginSeconds < 0 ? 'font-mono font-semibold text-danger' : 'font-mono font-semibold'
          }
          data-testid="margin"
        >
          {formatMinutes(view.marginSeconds)} (planned {formatMinutes(view.plannedMarginSeconds)})
        </dd>
        <dt className="text-text-muted">Against the plan</dt>
        <dd className="font-mono">
          {slip === 0 ? 'on time' : `${slip > 0 ? '+' : '−'}${formatMinutes(Math.abs(slip))}`}
        </dd>
      </dl>
      {view.missedNight.map((m) => (
        <Alert key={m.taskIndex} tone="caution" title={`Misses its night: ${m.title}`}>
          {m.nextWindow
            ? `Next night that fits: ${formatElapsed(m.nextWindow.start)}–${formatElapsed(m.nextWindow.end)}.`
            : 'No later night window has room for it today.'}
        </Alert>
      ))}
      {view.drop && (
        <Alert tone={view.drop.restores ? 'info' : 'danger'} title="To get the margin back">
          Drop {view.drop.taskIds.map(title).join(', ')}: margin {formatMinutes(view.drop.marginSeconds)}
          {view.drop.restores
            ? ` (back to ${formatMinutes(view.drop.targetMarginSeconds)} or more).`
            : `, still short of ${formatMinutes(view.drop.targetMarginSeconds)}: dropping the optional tasks is not enough.`}
        </Alert>
      )}
    </div>
  );
}
