import { formatElapsed, formatLength } from '@shared/compute/units';

/** Under an hour as `m:ss min`, else `h:mm h`: short walks need the seconds, a long one does not. */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '–';
  if (Math.round(seconds) < 3600) {
    const whole = Math.round(seconds);
    return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')} min`;
  }
  return `${formatElapsed(seconds)} h`;
}

/** `55.3 m (181.4 ft)`: both units, the chosen one first. */
export function formatBothLengths(metres: number, first: 'm' | 'ft' = 'm'): string {
  const second = first === 'm' ? 'ft' : 'm';
  return `${formatLength(metres, first)} (${formatLength(metres, second)})`;
}
