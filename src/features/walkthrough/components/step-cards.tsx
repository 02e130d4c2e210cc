import { useMemo } from 'react';
import { formatElapsed } from '@shared/compute/units';
import { tetherLine, type WalkStep } from '@shared/compute/walkthrough';
import type { Vec3 } from '@shared/schemas/station';
import type { WalkthroughNotes } from '@shared/schemas/walkthrough';
import { PLANNING_CAUTION_TEXT } from '@/components/ui/planning-caution';
import { STEP_TYPE_LABELS, stepCallout, trackPath, type Lane, type ListedStep } from '../lib/playback-model';

const W = 220;
const H = 130;
const PAD = 12;

/** Top-down (x starboard → right, y fore → up) projection fitted to a lane's whole path. */
function projector(points: readonly Vec3[]) {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const scale = Math.min((W - 2 * PAD) / Math.max(x1 - x0, 1e-6), (H - 2 * PAD) / Math.max(y1 - y0, 1e-6));
  const ox = (W - (x1 - x0) * scale) / 2;
  const oy = (H - (y1 - y0) * scale) / 2;
  return (p: Vec3): [number, number] => [ox + (p[0] - x0) * scale, H - (oy + (p[1] - y0) * scale)];
}

/** A label beside a point, turned to the left of it near the right edge so it stays inside the card. */
const labelAt = ([x, y]: [number, number], dy: number) =>
  x > W * 0.6 ? { x: x - 7, y: y + dy, textAnchor: 'end' as const } : { x: x + 7, y: y + dy };

const polyline = (pts: readonly [number, number][]) =>
  pts.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(' ');

export function StepDiagram({
  lane,
  step,
  positions,
}: {
  lane: Lane;
  step: WalkStep;
  positions: Record<string, Vec3>;
}) {
  const whole = useMemo(() => trackPath(lane.track), [lane.track]);
  const anchor = positions[step.anchorKey];
  const here = positions[step.nodeKey];
  const clip = step.clipKey ? positions[step.clipKey] : undefined;
  const framed = [...whole, anchor, here].filter((p): p is Vec3 => p !== undefined);
  if (framed.length === 0) return null;
  const project = projector(framed);
  const soFar = trackPath(lane.track, step.end).map(project);
  return (
    <svg
      viewBox={`0 0 ${W} ${H}`}
      width={W}
      height={H}
      role="img"
      aria-label={`Top view: the path so far, the anchor ${step.anchorKey} and ${step.nodeKey}`}
      className="shrink-0 rounded border border-surface-line bg-surface-page"
    >
      <polyline
        points={polyline(whole.map(project))}
        fill="none"
        stroke="#cfd6df"
        strokeWidth={2}
        strokeDasharray="4 3"
      />
      {soFar.length > 1 && (
        <polyline points={polyline(soFar)} fill="none" stroke="#0b6b66" strokeWidth={2.5} />
      )}
      {anchor && (
        <g>
          <rect
            x={project(anchor)[0] - 4.5}
            y={project(anchor)[1] - 4.5}
            width={9}
            height={9}
            fill="none"
            stroke="#111826"
            strokeWidth={2}
          />
          <text {...labelAt(project(anchor), -6)} fontSize={9} fill="#111826">
            ⚓ {step.anchorKey}
          </text>
        </g>
      )}
      {clip && step.clipKey !== step.anchorKey && (
        <rect x={project(clip)[0] - 4.5} y={project(clip)[1] - 4.5} width={9} height={9} fill="#0b6b66" />
      )}
      {here && (
        <g>
          <circle cx={project(here)[0]} cy={project(here)[1]} r={5} fill="#a3161c" />
          <text {...labelAt(project(here), 12)} fontSize={9} fontWeight={600} fill="#a3161c">
            {step.nodeKey}
          </text>
        </g>
      )}
      <text x={W - 4} y={H - 4} fontSize={8} textAnchor="end" fill="#4a5566">
        top view · fore ↑ · stbd →
      </text>
    </svg>
  );
}

/** What a step does with items, and the tether during it: the lines a crew member checks off. */
export function StepFacts({ step, className }: { step: WalkStep; className?: string }) {
  return (
    <ul className={className} aria-label="Equipment and tether">
      {step.equipment?.map((line) => (
        <li key={line} className="font-medium">
          <span aria-hidden="true">▸ </span>
          {line}
        </li>
      ))}
      <li data-tether-line="">
        <span aria-hidden="true">⚓ </span>
        {tetherLine(step)}
      </li>
    </ul>
  );
}

/** One printable card per step: number, elapsed time, crew, title, detail, trainer note, diagram. */
export function StepCards({
  title,
  steps,
  lanes,
  notes,
  positions,
}: {
  title: string;
  steps: readonly ListedStep[];
  lanes: readonly Lane[];
  notes: WalkthroughNotes;
  positions: Record<string, Vec3>;
}) {
  const laneOf = new Map(lanes.map((l) => [l.id, l]));
  return (
    <div className="step-cards grid gap-3 md:grid-cols-2 print:grid-cols-2" data-testid="step-cards">
      {steps.map((s) => {
        const lane = laneOf.get(s.lane)!;
        const note = notes[s.step.id];
        return (
          <article
            key={s.step.id}
            data-testid="step-card"
            className="flex break-inside-avoid flex-col gap-2 rounded-md border border-text-muted/40 bg-white p-3 text-text-strong"
          >
            <header className="flex items-baseline justify-between gap-2 border-b border-surface-line pb-1">
              <span className="text-lg font-bold">#{s.number}</span>
              <span className="font-mono text-sm tabular-nums">{formatElapsed(s.step.start)} elapsed</span>
              <span className="text-sm font-semibold">{lane.label}</span>
            </header>
            <div className="flex gap-3">
              <div className="min-w-0 flex-1">
                <p className="text-xs font-semibold tracking-wide text-text-muted uppercase">
                  {STEP_TYPE_LABELS[s.step.type]}
                </p>
                <h3 className="text-sm font-semibold">{stepCallout(s.step)}</h3>
                <p className="mt-1 text-xs text-text">{s.step.detail}</p>
                <StepFacts step={s.step} className="mt-1 text-xs" />
                {note && (
                  <p className="mt-2 rounded border border-caution/40 bg-caution-soft px-2 py-1 text-xs">
                    <span className="font-semibold">Trainer note: </span>
                    {note}
                  </p>
                )}
              </div>
              <StepDiagram lane={lane} step={s.step} positions={positions} />
            </div>
            <footer className="text-[9px] leading-tight text-text-muted">
              {title} · {PLANNING_CAUTION_TEXT}
            </footer>
          </article>
        );
      })}
    </div>
  );
}

/** Hides everything but the cards (and their heading) on paper. */
export const PRINT_CSS = `
@media print {
  @page { margin: 12mm; }
  body * { visibility: hidden; }
  [data-print-root], [data-print-root] * { visibility: visible; }
  [data-print-root] { position: absolute; inset: 0 auto auto 0; width: 100%; }
  [data-print-hide] { display: none !important; }
  .step-cards article { break-inside: avoid; page-break-inside: avoid; }
}`;
