import { useEffect, useLayoutEffect, useRef } from 'react';
import { formatElapsed, metresToFeet } from '@shared/compute/units';
import { sampleTrack } from '@shared/compute/walkthrough';
import type { OrbitWindow } from '@shared/compute/orbit';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/select';
import { cn } from '@/lib/cn';
import { useClock, type FollowTarget, type PlaybackClock } from '../lib/playback-clock';
import { isNight, nextEventTime, previousEventTime, SPEEDS, type Lane } from '../lib/playback-model';
import { LANE_STYLES } from './lane-styles';

/** Subscribes a DOM writer to every clock tick: per-frame readouts go through refs, not React state. */
function useClockWriter(clock: PlaybackClock, write: () => void) {
  const writer = useRef(write);
  useLayoutEffect(() => {
    writer.current = write;
  });
  useEffect(() => {
    writer.current();
    return clock.subscribe(() => writer.current());
  }, [clock]);
}

export function PlaybackControls({
  clock,
  lanes,
  eventTimes,
  nightWindows,
}: {
  clock: PlaybackClock;
  lanes: readonly Lane[];
  eventTimes: readonly number[];
  nightWindows: readonly OrbitWindow[];
}) {
  const playing = useClock(clock, (c) => c.playing);
  const speed = useClock(clock, (c) => c.speed);
  const follow = useClock(clock, (c) => c.follow);
  const night = useClock(clock, (c) => isNight(nightWindows, c.t));
  const hasClock = nightWindows.length > 0;
  const elapsed = useRef<HTMLSpanElement>(null);
  const scrub = useRef<HTMLInputElement>(null);
  const end = clock.endSeconds;

  useClockWriter(clock, () => {
    const text = formatElapsed(clock.t, { withSeconds: true });
    if (elapsed.current) elapsed.current.textContent = text;
    if (scrub.current) {
      scrub.current.value = String(Math.round(clock.t));
      scrub.current.setAttribute('aria-valuetext', `${formatElapsed(clock.t)} elapsed`);
    }
  });

  const jump = (to: number | null) => {
    if (to === null) return;
    clock.pause();
    clock.seek(to);
  };

  return (
    <div
      className="shrink-0 space-y-2 rounded-lg border border-surface-line bg-surface-panel px-3 py-2"
      role="group"
      aria-label="Playback"
    >
      <div className="flex flex-wrap items-center gap-2">
        <Button
          size="sm"
          variant="secondary"
          onClick={() => jump(previousEventTime(eventTimes, clock.t))}
          aria-label="Previous step"
        >
          ‹ Previous
        </Button>
        <Button size="sm" onClick={clock.toggle} className="min-w-20">
          {playing ? '❚❚ Pause' : '▶ Play'}
        </Button>
        <Button
          size="sm"
          variant="secondary"
          onClick={() => jump(nextEventTime(eventTimes, clock.t))}
          aria-label="Next step"
        >
          Next ›
        </Button>
        <p className="ml-2 font-mono text-sm text-text-strong tabular-nums">
          <span className="sr-only">Elapsed </span>
          <span ref={elapsed} data-testid="elapsed">
            0:00:00
          </span>
          <span className="text-text-muted"> / {formatElapsed(end, { withSeconds: true })}</span>
        </p>
        <label className="ml-2 flex items-center gap-1.5 text-sm font-medium text-text-strong">
          Speed
          <Select
            className="h-8 w-20"
            value={String(speed)}
            onChange={(e) => clock.setSpeed(Number(e.target.value))}
            options={SPEEDS.map((s) => ({ value: String(s), label: `${s}×` }))}
          />
        </label>
        <label className="flex items-center gap-1.5 text-sm font-medium text-text-strong">
          Camera
          <Select
            className="h-8 w-36"
            value={follow}
            onChange={(e) => clock.setFollow(e.target.value as FollowTarget)}
            options={[
              { value: 'free', label: 'Free orbit' },
              ...lanes.map((l) => ({ value: l.id, label: `Follow ${l.short}` })),
            ]}
          />
        </label>
        {hasClock && (
          <span
            data-testid="orbit-phase"
            className={cn(
              'ml-auto inline-flex items-center gap-1.5 rounded-full px-2.5 py-0.5 text-xs font-semibold',
              night ? 'bg-ink-900 text-ink-100' : 'bg-caution-soft text-caution',
            )}
          >
            <span aria-hidden="true">{night ? '☾' : '☀'}</span>
            {night ? 'Night' : 'Day'}
          </span>
        )}
      </div>
      <div className="relative">
        {hasClock && (
          <div
            aria-hidden="true"
            className="pointer-events-none absolute inset-x-0 top-1/2 h-2 -translate-y-1/2 overflow-hidden rounded bg-caution-soft"
          >
            {nightWindows.map((w) => (
              <div
                key={w.start}
                className="absolute inset-y-0 bg-ink-700"
                style={{
                  left: `${(w.start / end) * 100}%`,
                  width: `${((Math.min(w.end, end) - w.start) / end) * 100}%`,
                }}
              />
            ))}
          </div>
        )}
        <label className="sr-only" htmlFor="walkthrough-scrub">
          Elapsed time
        </label>
        <input
          id="walkthrough-scrub"
          ref={scrub}
          type="range"
          min={0}
          max={Math.max(1, Math.ceil(end))}
          step={1}
          defaultValue={0}
          onChange={(e) => clock.seek(Number(e.target.value))}
          onKeyDown={(e) => {
            // arrow keys step from one block of the day to the next; Page keys and Home/End as usual
            const forward = e.key === 'ArrowRight' || e.key === 'ArrowUp';
            if (!forward && e.key !== 'ArrowLeft' && e.key !== 'ArrowDown') return;
            e.preventDefault();
            jump(forward ? nextEventTime(eventTimes, clock.t) : previousEventTime(eventTimes, clock.t));
          }}
          aria-describedby="walkthrough-scrub-hint"
          className="relative w-full accent-accent focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent"
        />
        <p id="walkthrough-scrub-hint" className="text-xs text-text-muted">
          {hasClock && 'Dark bands on the bar are night. '}Arrow keys on the bar step from block to block.
        </p>
      </div>
    </div>
  );
}

const fmt = (m: number) => `${m.toFixed(1)} m`;
const fmtFt = (m: number) => `${metresToFeet(m).toFixed(0)} ft`;

/** Paid-out tether against each crew member's tether length, bar and numbers, updated every frame. */
export function TetherGauges({ clock, lanes }: { clock: PlaybackClock; lanes: readonly Lane[] }) {
  const bars = useRef<(HTMLDivElement | null)[]>([]);
  const texts = useRef<(HTMLSpanElement | null)[]>([]);
  useClockWriter(clock, () => {
    lanes.forEach((lane, i) => {
      const s = sampleTrack(lane.track, clock.t);
      const share = lane.tetherLengthM > 0 ? Math.min(1, s.paidOutM / lane.tetherLengthM) : 0;
      const bar = bars.current[i];
      if (bar) {
        bar.style.width = `${share * 100}%`;
        bar.dataset.near = share > 0.9 ? 'true' : 'false';
      }
      const text = texts.current[i];
      if (text) text.textContent = `${fmt(s.paidOutM)} (${fmtFt(s.paidOutM)}) out, clipped at ${s.anchorKey}`;
    });
  });
  return (
    <div className="space-y-2" role="group" aria-label="Tether paid out">
      {lanes.map((lane, i) => (
        <div key={lane.id}>
          <div className="flex flex-wrap justify-between gap-2 text-xs text-text">
            <span className="font-semibold text-text-strong">
              <span aria-hidden="true" style={{ color: LANE_STYLES[lane.id].color }}>
                {LANE_STYLES[lane.id].glyph}
              </span>{' '}
              {lane.label} tether
            </span>
            <span className="tabular-nums">
              <span ref={(el) => void (texts.current[i] = el)} data-testid={`paid-out-${lane.id}`} /> · of{' '}
              {fmt(lane.tetherLengthM)} ({fmtFt(lane.tetherLengthM)})
            </span>
          </div>
          <div className="mt-1 h-2.5 overflow-hidden rounded bg-surface-sunken" aria-hidden="true">
            <div
              ref={(el) => void (bars.current[i] = el)}
              className="h-full rounded bg-accent data-[near=true]:bg-caution"
              style={{ width: 0 }}
            />
          </div>
        </div>
      ))}
    </div>
  );
}
