import type { TimelineWarning, TimelineWarningCode } from '@shared/compute/day/types';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import type { PlanTimeline } from '../types';

export type WarningTarget =
  { kind: 'task'; index: number } | { kind: 'item'; index: number } | { kind: 'timeline' };

type Severity = 'danger' | 'caution' | 'note';

interface WarningRow {
  key: string;
  severity: Severity;
  heading: string;
  message: string;
  target?: WarningTarget;
}

/** Every code the day can raise, with its heading and how much it matters. */
const HEADINGS: Record<TimelineWarningCode, { heading: string; severity: Severity }> = {
  'over-time-limit': { heading: 'Over the time limit', severity: 'danger' },
  'route-infeasible': { heading: 'No route', severity: 'danger' },
  'route-caution': { heading: 'Caution volume', severity: 'caution' },
  'route-note': { heading: 'Route note', severity: 'note' },
  'eclipse-only-outside-night': { heading: 'Eclipse-only task in daylight', severity: 'danger' },
  'unknown-worksite': { heading: 'Unknown worksite', severity: 'danger' },
  'unknown-socket': { heading: 'Unknown socket', severity: 'danger' },
  'socket-out-of-reach': { heading: 'Worksite out of reach', severity: 'danger' },
  'socket-unusable': { heading: 'Unusable socket', severity: 'danger' },
  'restraint-missing': { heading: 'No foot restraint installed', severity: 'danger' },
  'restraint-occupied': { heading: 'Foot restraint already in use', severity: 'danger' },
  'socket-occupied': { heading: 'Socket already has a restraint', severity: 'danger' },
  'item-not-there': { heading: 'Item not there', severity: 'danger' },
  'item-not-held': { heading: 'Item not in hand', severity: 'danger' },
  'tool-not-at-hand': { heading: 'Tool not at hand', severity: 'danger' },
  'tool-not-in-manifest': { heading: 'Tool not in the manifest', severity: 'caution' },
  'unused-tool': { heading: 'Tool no task uses', severity: 'note' },
  'unknown-start': { heading: 'Item starts at an unknown place', severity: 'danger' },
  'unknown-place': { heading: 'Item action at an unknown place', severity: 'danger' },
  'left-outside': { heading: 'Left outside', severity: 'caution' },
  'unknown-arm': { heading: 'Unknown arm', severity: 'danger' },
  'arm-out-of-reach': { heading: 'Outside the arm’s reach', severity: 'danger' },
  'arm-path-keep-out': { heading: 'Arm path through a keep-out volume', severity: 'danger' },
  'arm-busy': { heading: 'Arm in use: rider waits', severity: 'caution' },
  'arm-egress-not-attach': { heading: 'Arm egress is not an attach point', severity: 'danger' },
  'after-out-of-order': { heading: 'Starts after a later task', severity: 'danger' },
};

const MARK = { danger: '⚠', caution: '△', note: 'ⓘ' } as const;
const TEXT = { danger: 'text-danger', caution: 'text-caution', note: 'text-text-muted' } as const;
const RANK: Record<Severity, number> = { danger: 0, caution: 1, note: 2 };

export function warningRows(timeline: PlanTimeline, itemKeys: readonly string[] = []): WarningRow[] {
  const target = (w: TimelineWarning): WarningTarget | undefined => {
    if (w.code === 'over-time-limit') return { kind: 'timeline' };
    if (w.taskIndex !== undefined) return { kind: 'task', index: w.taskIndex };
    const item = w.item === undefined ? -1 : itemKeys.indexOf(w.item);
    return item >= 0 ? { kind: 'item', index: item } : undefined;
  };
  return timeline.warnings.map((w, i) => ({
    key: `w${i}`,
    ...HEADINGS[w.code],
    message: w.message,
    target: target(w),
  }));
}

/** Rows of one code together, most serious kinds first: a repeated problem reads as one line with a count. */
export function groupedWarnings(rows: readonly WarningRow[]) {
  const groups = new Map<string, { heading: string; severity: Severity; rows: WarningRow[] }>();
  for (const r of rows) {
    const g = groups.get(r.heading) ?? { heading: r.heading, severity: r.severity, rows: [] };
    g.rows.push(r);
    groups.set(r.heading, g);
  }
  return [...groups.values()].sort((a, b) => RANK[a.severity] - RANK[b.severity]);
}

const targetLabel = (t: WarningTarget) =>
  t.kind === 'task'
    ? `Go to task ${t.index + 1}`
    : t.kind === 'item'
      ? `Go to manifest item ${t.index + 1}`
      : 'Go to the timeline';

export function WarningsPanel({
  timeline,
  itemKeys,
  onGoTo,
}: {
  timeline: PlanTimeline;
  itemKeys?: readonly string[];
  onGoTo: (target: WarningTarget) => void;
}) {
  const rows = warningRows(timeline, itemKeys);
  if (rows.length === 0) return <EmptyState>No warnings for the saved plan.</EmptyState>;
  return (
    <ul aria-label="Warnings" className="divide-y divide-surface-line">
      {groupedWarnings(rows).map((g) => (
        <li key={g.heading} className="py-2.5 text-sm" data-warning-group={g.heading}>
          <p className={`flex items-center gap-2 font-semibold ${TEXT[g.severity]}`}>
            <span aria-hidden="true">{MARK[g.severity]}</span>
            {g.heading}
            {g.rows.length > 1 && (
              <span className="rounded-full bg-surface-sunken px-2 text-xs text-text">{g.rows.length}</span>
            )}
          </p>
          <ul className="mt-1 space-y-1.5 pl-6">
            {g.rows.map((r) => (
              <li key={r.key} className="flex items-start gap-3">
                <p className="flex-1 text-text">{r.message}</p>
                {r.target && (
                  <Button variant="secondary" size="sm" onClick={() => onGoTo(r.target!)}>
                    {targetLabel(r.target)}
                  </Button>
                )}
              </li>
            ))}
          </ul>
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
