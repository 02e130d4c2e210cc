import {
  useId,
  useLayoutEffect,
  useRef,
  useState,
  type KeyboardEvent,
  type RefObject,
  type SVGProps,
} from 'react';
import type { CrewMember, Task } from '@shared/schemas/plan';
import type { TimelineBlock, TimelineBlockType } from '@shared/compute/day/types';
import type { RouteFeasible } from '@shared/schemas/route';
import { describeSwap } from '@shared/compute/day/describe';
import { formatElapsed, formatGmt, formatLength } from '@shared/compute/units';
import { palette } from '../../../../tailwind.config';
import type { PlanTimeline } from '../types';

const CREW: CrewMember[] = ['EV1', 'EV2'];
/** The drawing's width where the page's cannot be measured; otherwise it is the page's, in pixels. */
const DEFAULT_W = 1000;
/** Narrower than this the drawing scales down rather than squeezing the blocks further. */
const MIN_W = 560;
const LEFT = 56;
const RIGHT = 16;
const BAND_TOP = 22;
const LANE_H = 40;
const LANE_GAP = 12;
const laneTop = (i: number) => BAND_TOP + 6 + i * (LANE_H + LANE_GAP);
/** The time axis under the crew lanes and one lane per arm the day uses. */
const axisYBelow = (lanes: number) => laneTop(lanes) - LANE_GAP + 8;
const ARM_LANE_H = 30;

export const BLOCK_NAMES: Record<TimelineBlockType, string> = {
  egress: 'Egress',
  translate: 'Translate',
  swap: 'Tether swap',
  'restraint-in': 'Into foot restraint',
  work: 'Work',
  'restraint-out': 'Out of foot restraint',
  wait: 'Wait',
  ingress: 'Ingress',
  'arm-ride': 'On the arm',
};

/** Fill per block type: a pattern as well as a colour, so the kinds differ without colour. */
const FILL: Record<TimelineBlockType, { fill: string; stroke: string; text: string; dash?: string }> = {
  work: { fill: palette.accent.DEFAULT, stroke: palette.accent.strong, text: '#ffffff' },
  translate: { fill: 'url(#tl-hatch)', stroke: palette.ink[700], text: palette.text.strong },
  swap: { fill: 'url(#tl-cross)', stroke: palette.caution.DEFAULT, text: palette.text.strong },
  'restraint-in': { fill: palette.accent.soft, stroke: palette.accent.strong, text: palette.text.strong },
  'restraint-out': { fill: palette.accent.soft, stroke: palette.accent.strong, text: palette.text.strong },
  wait: { fill: palette.surface.panel, stroke: palette.text.muted, text: palette.text.muted, dash: '4 3' },
  egress: { fill: 'url(#tl-stripes)', stroke: palette.ink[700], text: palette.text.strong },
  ingress: { fill: 'url(#tl-stripes)', stroke: palette.ink[700], text: palette.text.strong },
  'arm-ride': { fill: 'url(#tl-arm)', stroke: palette.accent.strong, text: palette.text.strong },
};

function tickStep(horizon: number): number {
  if (horizon <= 3 * 3600) return 15 * 60;
  if (horizon <= 9 * 3600) return 30 * 60;
  return 3600;
}

export interface ActiveBlock {
  crew: CrewMember;
  block: TimelineBlock;
}

function blockTitle(block: TimelineBlock, tasks: readonly Task[]): string {
  const task = block.taskIndex === undefined ? undefined : tasks[block.taskIndex];
  if (block.type === 'work') return `Task ${block.taskIndex! + 1}: ${block.label}`;
  if (task && block.type !== 'translate')
    return `${block.label} (task ${block.taskIndex! + 1} “${task.title}”)`;
  return block.label;
}

function blockLabel(crew: CrewMember, block: TimelineBlock, tasks: readonly Task[]) {
  const span = `${formatElapsed(block.start)} to ${formatElapsed(block.end)}`;
  const extra = block.unreached ? ', not reached: see warnings' : '';
  return `${crew} ${BLOCK_NAMES[block.type]}: ${blockTitle(block, tasks)}, ${span}${extra}`;
}

const sentence = (s: string) => s[0].toUpperCase() + s.slice(1);

/** The translate piece's own stretch of the route, in metres. */
export function pieceLengthM(block: TimelineBlock, route: RouteFeasible | undefined): number {
  const legs = route?.legs.slice(block.legStart ?? 0, block.legEnd ?? route.legs.length) ?? [];
  return legs.reduce((s, l) => s + l.lengthM, 0);
}

export function BlockDetails({
  active,
  tasks,
  routes,
  startGmt,
  notes = [],
}: {
  active: ActiveBlock | null;
  tasks: readonly Task[];
  routes: readonly RouteFeasible[];
  startGmt?: string | null;
  /** the station notes at the block's nodes */
  notes?: readonly { nodeKey: string; title: string }[];
}) {
  if (!active) {
    return (
      <p className="text-sm text-text-muted">
        Point at or focus a block to see its times and route. Keyboard: Tab reaches the blocks once; arrow
        keys move along a lane and between lanes, Enter goes to the block.
      </p>
    );
  }
  const { crew, block } = active;
  const route = block.routeIndex === undefined ? undefined : routes[block.routeIndex];
  return (
    <div className="space-y-1 text-sm">
      <p className="font-semibold text-text-strong">
        {crew} · {BLOCK_NAMES[block.type]} · {blockTitle(block, tasks)}
      </p>
      <p>
        {formatElapsed(block.start)}–{formatElapsed(block.end)} elapsed
        {startGmt && ` · ${formatGmt(startGmt, block.start)}–${formatGmt(startGmt, block.end)} GMT`} (
        {formatElapsed(block.end - block.start, { withSeconds: true })})
        {block.unreached && <span className="ml-2 font-semibold text-danger">⚠ worksite not reached</span>}
      </p>
      {notes.map((n, i) => (
        <p key={i} className="font-medium text-text-strong">
          ▼ Station note at {n.nodeKey}: {n.title}
        </p>
      ))}
      {block.type === 'swap' && block.swapNode && (
        <p>
          {sentence(describeSwap(block.swapNode, block.releaseNode ?? block.swapNode).instruction)} (
          {formatLength(block.paidOutM ?? 0)} out).
        </p>
      )}
      {(block.type === 'restraint-in' || block.type === 'restraint-out') && block.socket && (
        <p>
          Socket {block.socket}
          {block.yawSetDeg !== undefined && `: set yaw ${block.yawSetDeg}°, pitch ${block.pitchSetDeg}°`}
        </p>
      )}
      {block.arm && (
        <p>
          On arm {block.arm}
          {block.to && ` (${block.type === 'arm-ride' ? 'to' : 'at'} ${block.to})`}
          {block.tetherAtEnd && `; tether then at ${block.tetherAtEnd.anchor}`}
        </p>
      )}
      {block.type === 'translate' && route && (
        <>
          <p>
            This stretch: {block.from} → {block.to}, {formatLength(pieceLengthM(block, route))}
            {block.tetherAtEnd &&
              `; clipped at ${block.tetherAtEnd.anchor}, ${formatLength(block.tetherAtEnd.paidOutM)} out at the end`}
          </p>
          <p>
            Whole route: {route.nodes[0]} → {route.nodes[route.nodes.length - 1]},{' '}
            {formatLength(route.lengthM)} ({formatLength(route.lengthM, 'ft')}), {route.swapCount} tether swap
            {route.swapCount === 1 ? '' : 's'}, most paid out {formatLength(route.maxPaidOutM)} of a{' '}
            {formatLength(route.tetherLengthM)} tether
          </p>
          {route.swaps.length > 0 && (
            <ul className="list-disc pl-5">
              {route.swaps.map((s, i) => (
                <li key={i}>
                  Swap at {s.node}, {formatLength(s.atM)} along, {formatLength(s.paidOutM)} paid out
                </li>
              ))}
            </ul>
          )}
          {route.cautionHazards.length > 0 && (
            <p className="text-caution">⚠ Passes caution volume {route.cautionHazards.join(', ')}</p>
          )}
        </>
      )}
    </div>
  );
}

/**
 * An arm's lane: who rides it when (a thin bar per session) and each move of its tip (a block named
 * for the rider, or "empty" when it moves to meet the next one).
 */
function ArmLaneRow({
  lane,
  top,
  x,
  roving,
}: {
  lane: PlanTimeline['arms'][number];
  top: number;
  x: (t: number) => number;
  /** the keyboard's place among all the chart's blocks (one Tab stop) */
  roving: (index: number) => SVGProps<SVGGElement>;
}) {
  const y = top + (LANE_H - ARM_LANE_H) / 2;
  return (
    <g role="list" aria-label={`${lane.key} arm lane`} data-arm-lane={lane.key}>
      <text x={8} y={top + LANE_H / 2 + 4} fontSize="11" fontWeight="600" fill={palette.text.strong}>
        {lane.key}
      </text>
      {lane.sessions.map((s, k) => (
        <g
          key={`s${k}`}
          role="listitem"
          aria-label={`${s.rider} on ${lane.key} ${formatElapsed(s.start)} to ${formatElapsed(s.end)}, on at ${s.ingress}, off at ${s.egress}`}
        >
          <rect
            x={x(s.start)}
            y={y + ARM_LANE_H + 2}
            width={Math.max(1, x(s.end) - x(s.start))}
            height={5}
            fill={s.rider === 'EV1' ? palette.accent.strong : palette.ink[700]}
          />
          {x(s.end) - x(s.start) > 60 && (
            <text x={x(s.start) + 2} y={y - 3} fontSize="10" fill={palette.text.muted}>
              {s.rider} rides
            </text>
          )}
        </g>
      ))}
      {lane.blocks.map((b, k) => {
        const bx = x(b.start);
        const bw = Math.max(1, x(b.end) - bx);
        const text = `${b.rider ?? 'empty'} → ${b.to}`;
        return (
          <g
            key={k}
            role="listitem"
            {...roving(k)}
            data-arm-block=""
            aria-label={`${b.label}, ${formatElapsed(b.start)} to ${formatElapsed(b.end)}`}
            className="outline-none"
          >
            <title>{`${b.label}, ${formatElapsed(b.start)}–${formatElapsed(b.end)}`}</title>
            <rect
              x={bx}
              y={y}
              width={bw}
              height={ARM_LANE_H}
              fill={b.rider ? 'url(#tl-arm)' : palette.surface.panel}
              stroke={palette.accent.strong}
              strokeDasharray={b.rider ? undefined : '4 3'}
            />
            {text.length * 5.8 < bw - 4 && (
              <text x={bx + 3} y={y + ARM_LANE_H / 2 + 4} fontSize="10" fill={palette.text.strong}>
                {text}
              </text>
            )}
          </g>
        );
      })}
    </g>
  );
}

function Patterns() {
  return (
    <defs>
      <pattern id="tl-hatch" width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
        <rect width="8" height="8" fill={palette.accent.soft} />
        <line x1="0" y1="0" x2="0" y2="8" stroke={palette.ink[700]} strokeWidth="2" />
      </pattern>
      <pattern id="tl-cross" width="6" height="6" patternUnits="userSpaceOnUse">
        <rect width="6" height="6" fill={palette.caution.soft} />
        <path d="M0 0L6 6M6 0L0 6" stroke={palette.caution.DEFAULT} strokeWidth="1" />
      </pattern>
      <pattern id="tl-arm" width="10" height="10" patternUnits="userSpaceOnUse">
        <rect width="10" height="10" fill={palette.accent.soft} />
        <circle cx="5" cy="5" r="2" fill={palette.accent.strong} />
      </pattern>
      <pattern
        id="tl-off-night"
        width="8"
        height="8"
        patternUnits="userSpaceOnUse"
        patternTransform="rotate(-45)"
      >
        <rect width="8" height="8" fill={palette.danger.DEFAULT} />
        <line x1="0" y1="0" x2="0" y2="8" stroke="#ffffff" strokeWidth="3" />
      </pattern>
      <pattern id="tl-stripes" width="6" height="6" patternUnits="userSpaceOnUse">
        <rect width="6" height="6" fill={palette.ink[100]} />
        <line x1="1" y1="0" x2="1" y2="6" stroke={palette.ink[300]} strokeWidth="2" />
      </pattern>
    </defs>
  );
}

export function TimelineLegend() {
  const kinds: TimelineBlockType[] = [
    'egress',
    'translate',
    'swap',
    'restraint-in',
    'work',
    'wait',
    'arm-ride',
  ];
  return (
    <ul aria-label="Legend" className="flex flex-wrap gap-x-2.5 gap-y-1 text-xs text-text">
      {kinds.map((k) => (
        <li key={k} className="flex items-center gap-1">
          <svg width="22" height="12" aria-hidden="true">
            <Patterns />
            <rect
              x="0.5"
              y="0.5"
              width="21"
              height="11"
              fill={FILL[k].fill}
              stroke={FILL[k].stroke}
              strokeDasharray={FILL[k].dash}
            />
          </svg>
          {k === 'egress'
            ? 'Egress / ingress'
            : k === 'restraint-in'
              ? 'Foot restraint in / out'
              : BLOCK_NAMES[k]}
        </li>
      ))}
      <li className="flex items-center gap-1">
        <svg width="22" height="12" aria-hidden="true">
          <rect width="22" height="12" fill={palette.ink[900]} fillOpacity="0.16" />
        </svg>
        ☾ Night
      </li>
      <li className="flex items-center gap-1">
        <svg width="22" height="12" aria-hidden="true">
          <line
            x1="11"
            y1="0"
            x2="11"
            y2="12"
            stroke={palette.danger.DEFAULT}
            strokeWidth="2"
            strokeDasharray="3 2"
          />
        </svg>
        Time limit
      </li>
      <li className="flex items-center gap-1">
        <svg width="22" height="12" aria-hidden="true">
          <line x1="11" y1="0" x2="11" y2="12" stroke={palette.ink[700]} strokeWidth="1.5" />
          <circle cx="11" cy="6" r="2.5" fill={palette.ink[700]} />
        </svg>
        Joint task
      </li>
      <li className="flex items-center gap-1">
        <svg width="22" height="12" aria-hidden="true">
          <Patterns />
          <rect
            x="0.5"
            y="0.5"
            width="21"
            height="11"
            fill="url(#tl-off-night)"
            stroke={palette.danger.DEFAULT}
          />
        </svg>
        ☾⚠ Eclipse-only, outside night
      </li>
      <li className="flex items-center gap-1">
        <svg width="22" height="12" aria-hidden="true">
          <path
            d="M6,2 h10 l-5,7 z"
            fill={palette.caution.DEFAULT}
            stroke={palette.text.strong}
            strokeWidth="0.8"
          />
        </svg>
        Station note at the block
      </li>
    </ul>
  );
}

/** Task indices worked by both crew members, with the start the two lanes share. */
function jointStarts(timeline: PlanTimeline): { taskIndex: number; start: number }[] {
  const ev2 = new Map(
    timeline.crew.EV2.blocks.filter((b) => b.type === 'work').map((b) => [b.taskIndex, b.start] as const),
  );
  return timeline.crew.EV1.blocks
    .filter((b) => b.type === 'work' && b.taskIndex !== undefined && ev2.get(b.taskIndex) === b.start)
    .map((b) => ({ taskIndex: b.taskIndex!, start: b.start }));
}

interface TimelineChartProps {
  timeline: PlanTimeline;
  tasks: readonly Task[];
  /** a block clicked (or Enter on it): e.g. go to it in the 3D day */
  onPick?: (pick: ActiveBlock) => void;
  /** the time shown in the 3D day, drawn as a line across both lanes */
  cursor?: number;
  /** the plan's start: GMT clock times beside elapsed ones */
  startGmt?: string | null;
}

/** The station notes at each block, by `<crew>-<block index>`. */
function notesByBlock(timeline: PlanTimeline): Map<string, { nodeKey: string; title: string }[]> {
  const out = new Map<string, { nodeKey: string; title: string }[]>();
  for (const n of timeline.stationNotes ?? [])
    for (const p of n.places) {
      const k = `${p.crew}-${p.block}`;
      out.set(k, [...(out.get(k) ?? []), n]);
    }
  return out;
}

const noteWords = (notes: readonly { nodeKey: string; title: string }[]) =>
  notes.map((n) => `station note at ${n.nodeKey}: ${n.title}`).join('; ');

/** Tasks the day warns are eclipse-only but not wholly inside a night window. */
function outsideNight(timeline: PlanTimeline): Set<number> {
  return new Set(
    timeline.warnings.flatMap((w) =>
      w.code === 'eclipse-only-outside-night' && w.taskIndex !== undefined ? [w.taskIndex] : [],
    ),
  );
}

/** Where an arrow key moves the keyboard's place among the blocks: `[lane, index]`, or null. */
export function roveTarget(
  lanes: readonly (readonly number[])[],
  [lane, index]: readonly [number, number],
  key: string,
): [number, number] | null {
  const last = (l: number) => lanes[l].length - 1;
  if (key === 'ArrowRight') return index < last(lane) ? [lane, index + 1] : null;
  if (key === 'ArrowLeft') return index > 0 ? [lane, index - 1] : null;
  if (key === 'Home') return [lane, 0];
  if (key === 'End') return [lane, last(lane)];
  if (key !== 'ArrowUp' && key !== 'ArrowDown') return null;
  const step = key === 'ArrowDown' ? 1 : -1;
  for (let l = lane + step; l >= 0 && l < lanes.length; l += step) {
    if (!lanes[l].length) continue;
    // the block of that lane under way when this one starts (else the first after it)
    const t = lanes[lane][index];
    let k = 0;
    while (k < last(l) && lanes[l][k + 1] <= t) k++;
    return [l, k];
  }
  return null;
}

/**
 * The two-person day: one lane per crew member over the orbit's night bands, on elapsed time. The
 * blocks are one Tab stop: arrow keys move along a lane and between lanes, Home and End to its ends.
 */
/**
 * The drawing's width: the element's own in pixels, so text and lanes keep their size and a wider
 * window gives the day more room instead of a taller chart.
 */
function useDrawingWidth(ref: RefObject<HTMLElement | null>) {
  const [width, setWidth] = useState(DEFAULT_W);
  useLayoutEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const fit = () => {
      if (el.clientWidth > 0) setWidth(Math.max(MIN_W, Math.round(el.clientWidth)));
    };
    fit();
    const observer = new ResizeObserver(fit);
    observer.observe(el);
    return () => observer.disconnect();
  }, [ref]);
  return width;
}

export function TimelineChart({ timeline, tasks, onPick, cursor, startGmt }: TimelineChartProps) {
  const [active, setActive] = useState<ActiveBlock | null>(null);
  const svg = useRef<SVGSVGElement>(null);
  const frame = useRef<HTMLDivElement>(null);
  const W = useDrawingWidth(frame);
  const laneStarts = [
    ...CREW.map((m) => timeline.crew[m].blocks.map((b) => b.start)),
    ...(timeline.arms ?? []).map((l) => l.blocks.map((b) => b.start)),
  ];
  const [place, setPlace] = useState<[number, number]>([0, 0]);
  const firstLane = Math.max(
    0,
    laneStarts.findIndex((l) => l.length > 0),
  );
  const rove: [number, number] = laneStarts[place[0]]?.[place[1]] !== undefined ? place : [firstLane, 0];
  const roving = (lane: number, index: number) => ({
    'data-rove': `${lane}:${index}`,
    tabIndex: rove[0] === lane && rove[1] === index ? 0 : -1,
    onFocusCapture: () => setPlace([lane, index]),
    onKeyDownCapture: (e: KeyboardEvent) => {
      const to = roveTarget(laneStarts, [lane, index], e.key);
      if (!to) return;
      e.preventDefault();
      setPlace(to);
      svg.current?.querySelector<SVGGElement>(`[data-rove="${to[0]}:${to[1]}"]`)?.focus();
    },
  });
  const dayNeeded = outsideNight(timeline);
  const notesAt = notesByBlock(timeline);
  const detailsId = useId();
  const horizon = Math.max(timeline.timeLimitSeconds, timeline.endSeconds, 60) * 1.03;
  const x = (t: number) => LEFT + (t / horizon) * (W - LEFT - RIGHT);
  const step = tickStep(horizon);
  const ticks: number[] = [];
  for (let t = 0; t <= horizon; t += step) ticks.push(t);
  const limitX = x(timeline.timeLimitSeconds);
  const armLanes = timeline.arms ?? [];
  const AXIS_Y = axisYBelow(CREW.length + armLanes.length);
  const gmtRow = startGmt ? 13 : 0;
  const H = AXIS_Y + 40 + gmtRow;

  return (
    <div className="space-y-3" ref={frame}>
      <svg
        ref={svg}
        viewBox={`0 0 ${W} ${H}`}
        className="w-full select-none"
        role="group"
        aria-label={`Timeline: the day ends at ${formatElapsed(timeline.endSeconds)} elapsed, limit ${formatElapsed(timeline.timeLimitSeconds)}`}
        aria-describedby={detailsId}
        onMouseLeave={() => setActive(null)}
      >
        <Patterns />
        <g aria-label="Night windows" role="list">
          {timeline.nightWindows.map((w, i) => (
            <g
              key={i}
              role="listitem"
              aria-label={`Night ${formatElapsed(w.start)}–${formatElapsed(w.end)}`}
              data-night-band=""
            >
              <rect
                x={x(w.start)}
                y={BAND_TOP}
                width={Math.max(1, x(w.end) - x(w.start))}
                height={AXIS_Y - BAND_TOP}
                fill={palette.ink[900]}
                fillOpacity="0.16"
              />
              {x(w.end) - x(w.start) > 50 && (
                <text x={x(w.start) + 4} y={BAND_TOP - 6} fontSize="11" fill={palette.ink[800]}>
                  ☾ Night {formatElapsed(w.start)}–{formatElapsed(w.end)}
                </text>
              )}
            </g>
          ))}
        </g>
        {CREW.map((m, i) => (
          <text
            key={m}
            x={8}
            y={laneTop(i) + LANE_H / 2 + 4}
            fontSize="13"
            fontWeight="600"
            fill={palette.text.strong}
          >
            {m}
          </text>
        ))}
        {jointStarts(timeline).map((j) => (
          <g key={j.taskIndex} aria-hidden="true">
            <line
              x1={x(j.start)}
              x2={x(j.start)}
              y1={laneTop(0) + LANE_H}
              y2={laneTop(1)}
              stroke={palette.ink[700]}
              strokeWidth="1.5"
            />
            <circle cx={x(j.start)} cy={laneTop(0) + LANE_H + LANE_GAP / 2} r="3" fill={palette.ink[700]} />
          </g>
        ))}
        {CREW.map((m, i) => (
          <g key={m} role="list" aria-label={`${m} blocks`}>
            {timeline.crew[m].blocks.map((b, k) => {
              const look = FILL[b.type];
              const bx = x(b.start);
              const bw = Math.max(1, x(b.end) - bx);
              const long = b.type === 'work' ? `${b.taskIndex! + 1}. ${b.label}` : BLOCK_NAMES[b.type];
              const short = b.type === 'work' ? String(b.taskIndex! + 1) : '';
              const label = long.length * 6.2 < bw - 6 ? long : short;
              const fits = label !== '' && label.length * 6.2 < bw - 6;
              const isActive = active?.crew === m && active.block === b;
              const offNight = b.type === 'work' && b.taskIndex !== undefined && dayNeeded.has(b.taskIndex);
              const warn = b.unreached || offNight;
              const notes = notesAt.get(`${m}-${k}`);
              return (
                <g
                  key={k}
                  role="listitem"
                  {...roving(i, k)}
                  aria-label={`${blockLabel(m, b, tasks)}${offNight ? ', eclipse-only but not inside a night window' : ''}${notes ? `, ${noteWords(notes)}` : ''}`}
                  data-block-type={b.type}
                  data-station-notes={notes ? notes.length : undefined}
                  data-outside-night={offNight ? '' : undefined}
                  className="cursor-pointer outline-none"
                  onMouseEnter={() => setActive({ crew: m, block: b })}
                  onFocus={() => setActive({ crew: m, block: b })}
                  onClick={() => onPick?.({ crew: m, block: b })}
                  onKeyDown={(e) => {
                    if (e.key !== 'Enter' && e.key !== ' ') return;
                    e.preventDefault();
                    onPick?.({ crew: m, block: b });
                  }}
                >
                  <rect
                    x={bx}
                    y={laneTop(i)}
                    width={bw}
                    height={LANE_H}
                    fill={look.fill}
                    stroke={warn ? palette.danger.DEFAULT : isActive ? palette.text.strong : look.stroke}
                    strokeWidth={warn || isActive ? 2.5 : 1}
                    strokeDasharray={warn ? undefined : look.dash}
                  />
                  {offNight && (
                    <rect
                      x={bx}
                      y={laneTop(i) + LANE_H - 7}
                      width={bw}
                      height={7}
                      fill="url(#tl-off-night)"
                      aria-hidden="true"
                    />
                  )}
                  {notes && (
                    <g aria-hidden="true">
                      <path
                        d={`M${bx + bw / 2 - 5},${laneTop(i) - 9} h10 l-5,7 z`}
                        fill={palette.caution.DEFAULT}
                        stroke={palette.text.strong}
                        strokeWidth="0.8"
                      />
                    </g>
                  )}
                  {fits && (
                    <text
                      x={bx + 4}
                      y={laneTop(i) + LANE_H / 2 + 4}
                      fontSize="11"
                      fill={look.text}
                      fontWeight={b.type === 'work' ? 600 : 400}
                    >
                      {offNight ? `☾⚠ ${label}` : b.unreached ? `⚠ ${label}` : label}
                    </text>
                  )}
                </g>
              );
            })}
          </g>
        ))}
        {armLanes.map((lane, a) => (
          <ArmLaneRow
            key={lane.key}
            lane={lane}
            top={laneTop(CREW.length + a)}
            x={x}
            roving={(k) => roving(CREW.length + a, k)}
          />
        ))}
        {cursor !== undefined && (
          <g aria-hidden="true" data-testid="timeline-cursor" data-t={Math.round(cursor)}>
            <line
              x1={x(cursor)}
              x2={x(cursor)}
              y1={BAND_TOP}
              y2={AXIS_Y + 4}
              stroke={palette.text.strong}
              strokeWidth="2.5"
            />
          </g>
        )}
        <g aria-hidden="true">
          <line
            x1={limitX}
            x2={limitX}
            y1={BAND_TOP - 2}
            y2={AXIS_Y}
            stroke={palette.danger.DEFAULT}
            strokeWidth="2"
            strokeDasharray="5 3"
          />
          <text
            x={limitX + 4}
            y={AXIS_Y + 34 + gmtRow}
            fontSize="11"
            fontWeight="600"
            textAnchor="end"
            fill={palette.danger.DEFAULT}
          >
            Limit {formatElapsed(timeline.timeLimitSeconds)}
          </text>
          <line x1={LEFT} x2={W - RIGHT} y1={AXIS_Y} y2={AXIS_Y} stroke={palette.text.muted} />
          {ticks.map((t) => (
            <g key={t}>
              <line x1={x(t)} x2={x(t)} y1={AXIS_Y} y2={AXIS_Y + 5} stroke={palette.text.muted} />
              <text x={x(t)} y={AXIS_Y + 18} fontSize="11" textAnchor="middle" fill={palette.text.muted}>
                {formatElapsed(t)}
              </text>
              {startGmt && (
                <text x={x(t)} y={AXIS_Y + 31} fontSize="10" textAnchor="middle" fill={palette.text.muted}>
                  {formatGmt(startGmt, t)}
                </text>
              )}
            </g>
          ))}
        </g>
      </svg>
      <TimelineLegend />
      <div
        id={detailsId}
        aria-live="polite"
        className="min-h-14 rounded-md border border-surface-line bg-surface-sunken px-3 py-2"
      >
        <BlockDetails
          active={active}
          tasks={tasks}
          routes={timeline.routes}
          startGmt={startGmt}
          notes={
            active
              ? notesAt.get(`${active.crew}-${timeline.crew[active.crew].blocks.indexOf(active.block)}`)
              : []
          }
        />
      </div>
    </div>
  );
}
