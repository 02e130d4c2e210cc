import type { TimelineWarningCode } from '@shared/compute/timeline';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import type { PlanTimeline } from '../types';

export type WarningTarget =
  { kind: 'task'; index: number } | { kind: 'item'; index: number } | { kind: 'timeline' };

interface WarningRow {
  key: string;
  severity: 'danger' | 'caution' | 'note';
  heading: string;
  message: string;
  target?: WarningTarget;
}

const TIMELINE_HEADINGS: Record<TimelineWarningCode, { heading: string; severity: WarningRow['severity'] }> =
  {
    'over-time-limit': { heading: 'Over the time limit', severity: 'danger' },
    'route-infeasible': { heading: 'No route', severity: 'danger' },
    'route-caution': { heading: 'Caution volume', severity: 'caution' },
    'route-note': { heading: 'Route note', severity: 'note' },
    'eclipse-only-outside-night': { heading: 'Eclipse-only task in daylight', severity: 'danger' },
    'unknown-worksite': { heading: 'Unknown worksite', severity: 'danger' },
    'unknown-socket': { heading: 'Unknown socket', severity: 'danger' },
  };

const MARK = { danger: '⚠', caution: '△', note: 'ⓘ' } as const;
const TEXT = { danger: 'text-danger', caution: 'text-caution', note: 'text-text-muted' } as const;

export function warningRows(timeline: PlanTimeline): WarningRow[] {
  const task = (index?: number): WarningTarget | undefined =>
    index === undefined ? undefined : { kind: 'task', index };
  return [
    ...timeline.warnings.map((w, i) => ({
      key: `t${i}`,
      ...TIMELINE_HEADINGS[w.code],
      message: w.message,
      target: w.code === 'over-time-limit' ? ({ kind: 'timeline' } as const) : task(w.taskIndex),
    })),
    ...timeline.reachWarnings.map((w, i) => ({
      key: `r${i}`,
      severity: 'danger' as const,
      heading: w.code === 'socket-out-of-reach' ? 'Worksite out of reach' : 'Unusable socket',
      message: w.message,
      target: task(w.taskIndex),
    })),
    ...timeline.inventoryWarnings.map((w, i) => ({
      key: `i${i}`,
      severity: 'caution' as const,
      heading: 'Inventory',
      message: w.message,
      target: w.itemIndex !== undefined ? ({ kind: 'item', index: w.itemIndex } as const) : task(w.taskIndex),
    })),
  ];
}

const targetLabel = (t: WarningTarget) =>
  t.kind === 'task'
    ? `Go to task ${t.index + 1}`
    : t.kind === 'item'
      ? `Go to manifest item ${t.index + 1}`
      : 'Go to the timeline';

export function WarningsPanel({
  timeline,
  onGoTo,
}: {
  timeline: PlanTimeline;
  onGoTo: (target: WarningTarget) => void;
}) {
  const rows = warningRows(timeline);
  if (rows.length === 0) return <EmptyState>No warnings for the saved plan.</EmptyState>;
  return (
    <ul aria-label="Warnings" className="divide-y divide-surface-line">
      {rows.map((r) => (
        <li key={r.key} className="flex items-start gap-3 py-2.5 text-sm">
          <span aria-hidden="true" className={`mt-0.5 font-bold ${TEXT[r.severity]}`}>
            {MARK[r.severity]}
          </span>
          <div className="flex-1">
            <p className={`font-semibold ${TEXT[r.severity]}`}>{r.heading}</p>
            <p className="text-text">{r.message}</p>
          </div>
          {r.target && (
            <Button variant="secondary" size="sm" onClick={() => onGoTo(r.target!)}>
              {targetLabel(r.target)}
            </Button>
          )}
        </li>
      ))}
    </ul>
  );
}

/** Warnings per task index, for the task list's markers. */
export function warningCountsByTask(timeline: PlanTimeline | undefined): Map<number, number> {
  const counts = new Map<number, number>();
  for (const r of timeline ? warningRows(timeline) : []) {
    if (r.target?.kind === 'task' && r.severity !== 'note')
      counts.set(r.target.index, (counts.get(r.target.index) ?? 0) + 1);
  }
  return counts;
}
