import { Link } from 'react-router-dom';
import type { DayNote, NotePlace } from '@shared/compute/station-notes';
import { formatElapsed } from '@shared/compute/units';
import { focusRing } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';
import type { DayFocus } from '../types';

/** What the crew member does at the noted node, in a few words. */
export function placeWords(p: Pick<NotePlace, 'crew' | 'use' | 'taskIndex' | 'type'>): string {
  const task = p.taskIndex === undefined ? '' : ` (task ${p.taskIndex + 1})`;
  switch (p.use) {
    case 'route':
      return p.taskIndex === undefined ? `${p.crew} passes on the way in` : `${p.crew} passes${task}`;
    case 'swap':
      return `${p.crew} swaps tether here${task}`;
    case 'worksite':
      return `${p.crew} works here${task}`;
    case 'socket':
      return `${p.crew} foot restraint here${task}`;
    case 'arm':
      return `${p.crew} on the arm here${task}`;
    case 'airlock':
      return `${p.crew} ${p.type === 'egress' ? 'egress' : 'ingress'}`;
  }
}

/** The places of a note, one per crew member, task and use (the first block of each run). */
function distinctPlaces(places: readonly NotePlace[]): NotePlace[] {
  const seen = new Set<string>();
  return places.filter((p) => {
    const k = `${p.crew}|${p.taskIndex ?? '-'}|${p.use}|${p.type === 'egress' ? 'out' : ''}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

/** The open station notes pinned to nodes the day uses: each with where the crew meets it. */
export function StationNotesPanel({
  notes,
  stationId,
  onGoTo,
}: {
  notes: readonly DayNote[];
  stationId: number;
  onGoTo: (focus: DayFocus) => void;
}) {
  if (!notes.length) return <EmptyState>No open station notes on this day’s way.</EmptyState>;
  return (
    <ul className="space-y-3" aria-label="Station notes on this day">
      {notes.map((n) => (
        <li key={n.id} className="space-y-1 text-sm" data-station-note={n.id}>
          <p className="font-semibold text-text-strong">
            <span aria-hidden="true" className="text-caution">
              ▼{' '}
            </span>
            {n.title}
          </p>
          <p className="text-xs text-text-muted">
            at{' '}
            <Link
              className={cn('font-mono underline', focusRing)}
              to={`${paths.station.getHref(stationId)}?node=${encodeURIComponent(n.nodeKey)}`}
            >
              {n.nodeKey}
            </Link>
          </p>
          {n.body && <p className="text-text">{n.body}</p>}
          <ul className="flex flex-wrap gap-1.5">
            {distinctPlaces(n.places).map((p) => (
              <li key={`${p.crew}-${p.block}`}>
                <button
                  type="button"
                  className={cn(
                    'rounded border border-surface-line bg-surface-sunken px-2 py-0.5 text-xs text-text-strong hover:bg-surface-panel',
                    focusRing,
                  )}
                  onClick={() => onGoTo({ crew: p.crew, start: p.start, end: p.end })}
                >
                  {formatElapsed(p.start)} · {placeWords(p)}
                </button>
              </li>
            ))}
          </ul>
        </li>
      ))}
    </ul>
  );
}
