import { useEffect, useState } from 'react';
import { formatElapsed } from '@shared/compute/units';

/** Seconds of EVA elapsed time since `startedAt`, ticking once a second. */
export function useElapsed(startedAt: string): number {
  const [nowMs, setNowMs] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNowMs(Date.now()), 1000);
    return () => clearInterval(timer);
  }, []);
  return Math.max(0, (nowMs - Date.parse(startedAt)) / 1000);
}

/** GMT of a moment of EVA elapsed time, `HH:MM:SS`. */
export const gmtAt = (startedAt: string, elapsed: number) =>
  new Date(Date.parse(startedAt) + elapsed * 1000).toISOString().slice(11, 19);

/** The big clock: GMT and EVA elapsed time, readable across a room. */
export function RunClock({ startedAt, elapsed }: { startedAt: string; elapsed: number }) {
  return (
    <div className="flex flex-wrap items-end gap-x-10 gap-y-2" role="timer" aria-label="Run clock">
      <div>
        <div className="text-xs font-semibold tracking-wide text-text-muted uppercase">GMT</div>
        <div
          className="font-mono text-5xl font-semibold text-text-strong tabular-nums"
          data-testid="clock-gmt"
        >
          {gmtAt(startedAt, elapsed)}
        </div>
      </div>
      <div>
        <div className="text-xs font-semibold tracking-wide text-text-muted uppercase">Elapsed</div>
        <div
          className="font-mono text-5xl font-semibold text-accent-strong tabular-nums"
          data-testid="clock-elapsed"
        >
          {formatElapsed(elapsed, { withSeconds: true })}
        </div>
      </div>
    </div>
  );
}
