import type { StepNote } from '@shared/compute/station-notes';
import { cn } from '@/lib/cn';

/** The station notes of each step, by step id. */
export function stationNotesByStep(notes: readonly StepNote[]): Map<string, StepNote[]> {
  const out = new Map<string, StepNote[]>();
  for (const n of notes) for (const id of n.steps) out.set(id, [...(out.get(id) ?? []), n]);
  return out;
}

/** The station notes pinned to a node of one step: where and what, the text below when asked. */
export function StationNoteLines({
  notes,
  withBody = false,
  className,
}: {
  notes: readonly StepNote[] | undefined;
  withBody?: boolean;
  className?: string;
}) {
  if (!notes?.length) return null;
  return (
    <ul className={cn('space-y-0.5', className)} aria-label="Station notes at this step">
      {notes.map((n) => (
        <li key={n.id} data-station-note={n.id}>
          <span aria-hidden="true" className="text-caution">
            ▼{' '}
          </span>
          <span className="font-semibold">Station note at {n.nodeKey}:</span> {n.title}
          {withBody && n.body && <span className="block opacity-90">{n.body}</span>}
        </li>
      ))}
    </ul>
  );
}
