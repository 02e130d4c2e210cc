import { useEffect, useState } from 'react';
import { formatElapsed, formatGmt, formatMinutes } from '@shared/compute/units';

/** Seconds of EVA elapsed time since `startedAt`, ticking once a second. */
export function useElapsed(startedAt: string): number {
  const [nowMs, setNowMs] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNowMs(Date.now()), 1000);
    return () => clearInterval(timer);
  }, []);
  return Math.max(0, (nowMs - Date.parse(startedAt)) / 1000);
}

/** The big clock: GMT and EVA elapsed time, readable across a room. */
export function RunClock({ startedAt, elapsed }: { startedAt: string; elapsed: number }) {
  return (
    <div className="flex flex-wrap items-end gap-x-10 gap-y-2" role="timer" aria-label="Run clock">
      <div>
        <div className="text-xs font-semibold tracking-wide text-text-muted uppercase xl:text-sm">GMT</div>
        <div
          className="font-mono text-5xl font-semibold text-text-strong tabular-nums xl:text-7xl 2xl:text-8xl"
          data-testid="clock-gmt"
        >
          {formatGmt(startedAt, elapsed, { withSeconds: true })}
        </div>
      </div>
      <div>
        <div className="text-xs font-semibold tracking-wide text-text-muted uppercase xl:text-sm">
          Elapsed
        </div>
        <div
          className="font-mono text-5xl font-semibold text-accent-strong tabular-nums xl:text-7xl 2xl:text-8xl"
          data-testid="clock-elapsed"
        >
          {formatElapsed(elapsed, { withSeconds: true })}
        </div>
      </div>
    </div>
  );
}

/** The plan's start time beside the run's: how late (or early) the EVA clock started. */
export function PlannedStart({ planned, started }: { planned: string; started: string }) {
  const late = (Date.parse(started) - Date.parse(planned)) / 1000;
  // a start half a day away is another day's plan: its date says more than the minutes
  const text =
    Math.abs(late) >= 12 * 3600
      ? `planned ${planned.slice(0, 10)} ${formatGmt(planned, 0)} GMT`
      : `planned ${formatGmt(planned, 0)} GMT (${
          Math.abs(late) < 30 ? 'on time' : `${late > 0 ? '+' : '−'}${formatMinutes(Math.abs(late))}`
        })`;
  return <span data-testid="planned-start"> · {text}</span>;
}
