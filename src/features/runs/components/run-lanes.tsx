import type { CrewMember } from '@shared/schemas/plan';
import type { ActualBlock } from '@shared/compute/day/run';
import type { TimelineBlock } from '@shared/compute/day/types';
import { formatElapsed, formatGmt } from '@shared/compute/units';
import { palette } from '../../../../tailwind.config';

const CREW: CrewMember[] = ['EV1', 'EV2'];
const W = 1200;
const LEFT = 150;
const RIGHT = 16;
const PLOT = W - LEFT - RIGHT;
const ROW_H = 30;
const ROW_GAP = 6;
const LANE_GAP = 22;
const TOP = 8;
const laneTop = (i: number) => TOP + i * (2 * ROW_H + ROW_GAP + LANE_GAP);
const AXIS_Y = laneTop(2) - LANE_GAP + 14;

interface RunLanesProps {
  now: number;
  planned: Record<CrewMember, TimelineBlock[]>;
  actual: Record<CrewMember, ActualBlock[]>;
  projected: Record<CrewMember, TimelineBlock[]>;
  titleOf: (taskIndex: number | undefined) => string;
  crewNames: Record<CrewMember, string>;
  /** GMT of elapsed time 0: the axis shows clock times under elapsed ones */
  startedAt?: string;
}

/**
 * Two crew lanes, each the planned day above what was flown (solid) and the rest re-projected from
 * now (lighter), with the now line across both.
 */
export function RunLanes({ now, planned, actual, projected, titleOf, crewNames, startedAt }: RunLanesProps) {
  const ends = CREW.flatMap((m) => [...planned[m], ...projected[m], ...actual[m]].map((b) => b.end));
  const horizon = Math.max(now, ...ends, 600) * 1.02;
  const x = (t: number) => LEFT + (t / horizon) * PLOT;
  const step = horizon <= 3 * 3600 ? 15 * 60 : horizon <= 9 * 3600 ? 30 * 60 : 3600;
  const ticks: number[] = [];
  for (let t = 0; t <= horizon; t += step) ticks.push(t);

  const bar = (
    key: string,
    b: { type: string; start: number; end: number; taskIndex?: number },
    y: number,
    tone: 'plan' | 'flown' | 'ahead',
  ) => {
    const work = b.type === 'work';
    const fill = work
      ? tone === 'plan'
        ? palette.accent.soft
        : tone === 'flown'
          ? palette.accent.DEFAULT
          : palette.accent.bright
      : tone === 'flown'
        ? palette.ink[700]
        : palette.surface.sunken;
    const w = Math.max(1, x(b.end) - x(b.start));
    const label = work ? titleOf(b.taskIndex) : b.type === 'egress' || b.type === 'ingress' ? b.type : '';
    return (
      <g key={key}>
        <rect
          x={x(b.start)}
          y={y}
          width={w}
          height={ROW_H}
          rx={3}
          fill={fill}
          stroke={palette.surface.line}
        />
        {label && w > 60 && (
          <text
            x={x(b.start) + 4}
            y={y + ROW_H / 2 + 5}
            fontSize={13}
            fill={tone === 'flown' ? '#ffffff' : palette.text.strong}
          >
            {label.length * 7 > w ? `${label.slice(0, Math.max(1, Math.floor(w / 7) - 1))}…` : label}
          </text>
        )}
        <title>{`${label || b.type} ${formatElapsed(b.start)}–${formatElapsed(b.end)}`}</title>
      </g>
    );
  };

  return (
    <svg
      viewBox={`0 0 ${W} ${AXIS_Y + (startedAt ? 36 : 24)}`}
      className="w-full"
      role="img"
      aria-label="Crew lanes: planned above, flown and projected below, with the now line"
      data-testid="run-lanes"
    >
      {ticks.map((t) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={TOP} y2={AXIS_Y} stroke={palette.surface.line} />
          <text x={x(t)} y={AXIS_Y + 16} fontSize={12} textAnchor="middle" fill={palette.text.muted}>
            {formatElapsed(t)}
          </text>
          {startedAt && (
            <text x={x(t)} y={AXIS_Y + 30} fontSize={11} textAnchor="middle" fill={palette.text.muted}>
              {formatGmt(startedAt, t)}
            </text>
          )}
        </g>
      ))}
      {CREW.map((m, i) => {
        const top = laneTop(i);
        const ahead = projected[m].filter((b) => b.end > now && b.type !== 'wait');
        return (
          <g key={m} data-crew={m}>
            <text x={8} y={top + 20} fontSize={16} fontWeight={600} fill={palette.text.strong}>
              {m}
            </text>
            <text x={8} y={top + 38} fontSize={12} fill={palette.text.muted}>
              {crewNames[m]}
            </text>
            <text
              x={LEFT - 8}
              y={top + ROW_H / 2 + 4}
              fontSize={11}
              textAnchor="end"
              fill={palette.text.muted}
            >
              planned
            </text>
            <text
              x={LEFT - 8}
              y={top + ROW_H + ROW_GAP + ROW_H / 2 + 4}
              fontSize={11}
              textAnchor="end"
              fill={palette.text.muted}
            >
              flown · ahead
            </text>
            {planned[m].filter((b) => b.type !== 'wait').map((b, j) => bar(`p${j}`, b, top, 'plan'))}
            {ahead.map((b, j) =>
              bar(`a${j}`, { ...b, start: Math.max(b.start, now) }, top + ROW_H + ROW_GAP, 'ahead'),
            )}
            {actual[m].map((b, j) => bar(`f${j}`, b, top + ROW_H + ROW_GAP, 'flown'))}
          </g>
        );
      })}
      <line
        x1={x(now)}
        x2={x(now)}
        y1={TOP - 4}
        y2={AXIS_Y}
        stroke={palette.danger.DEFAULT}
        strokeWidth={3}
        data-testid="now-line"
      />
      <text x={x(now) + 4} y={AXIS_Y - 4} fontSize={12} fontWeight={600} fill={palette.danger.DEFAULT}>
        now
      </text>
    </svg>
  );
}
