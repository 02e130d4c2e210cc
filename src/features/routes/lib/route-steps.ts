import type { RouteFeasible, RouteLeg, TetherSwap } from '@shared/schemas/route';
import { formatLength, type LengthUnit } from '@shared/compute/units';
import { formatDuration } from './format-route';

export type RouteStepKind = 'start' | 'handrail' | 'hop' | 'ride' | 'swap' | 'arrive';

export interface RouteStep {
  kind: RouteStepKind;
  /** the step in the trade's words, e.g. "Translate 4.2 m along the handrail to PB3-A07" */
  text: string;
  detail?: string;
  /** where the step ends (a swap: the new attach point) */
  nodeKey: string;
  /** 1-based, swaps only: matches the numbered marker in 3D */
  swapNumber?: number;
}

const EPS_M = 1e-6;

function moveText(kind: RouteLeg['kind'], lengthM: number, to: string, unit: LengthUnit): string {
  const length = formatLength(lengthM, unit);
  if (kind === 'hop') return `Hop ${length} to ${to}`;
  if (kind === 'ride') return `Ride the arm ${length} to ${to}`;
  return `Translate ${length} along the handrail to ${to}`;
}

function moveStep(legs: readonly RouteLeg[], unit: LengthUnit): RouteStep {
  const kind = legs[0].kind;
  const lengthM = legs.reduce((s, l) => s + l.lengthM, 0);
  const seconds = legs.reduce((s, l) => s + l.seconds, 0);
  const to = legs[legs.length - 1].to;
  const via = legs.length > 1 ? `, ${legs.length} legs from ${legs[0].from}` : ` from ${legs[0].from}`;
  const extra = kind === 'hop' ? ', including the fixed hop time' : '';
  return {
    kind,
    text: moveText(kind, lengthM, to, unit),
    detail: `${formatDuration(seconds)}${via}${extra}`,
    nodeKey: to,
  };
}

function swapStep(swap: TetherSwap, number: number, releasedAt: string, unit: LengthUnit): RouteStep {
  return {
    kind: 'swap',
    text: `Tether swap at ${swap.node}: clip the new hook, then release the old one`,
    detail: `Old hook at ${releasedAt}, ${formatLength(swap.paidOutM, unit)} paid out.`,
    nodeKey: swap.node,
    swapNumber: number,
  };
}

/**
 * The route as the crew member meets it: runs of legs of one kind merged into one move, broken at
 * every tether swap, which the engine places at the end of a leg (at distance `atM`).
 */
export function routeSteps(route: RouteFeasible, unit: LengthUnit = 'm'): RouteStep[] {
  const start = route.nodes[0];
  const end = route.nodes[route.nodes.length - 1];
  const steps: RouteStep[] = [
    {
      kind: 'start',
      text: `Start at ${start}, tether clipped there`,
      detail: `${formatLength(route.tetherLengthM, unit)} tether.`,
      nodeKey: start,
    },
  ];
  let run: RouteLeg[] = [];
  let s = 0;
  let anchor = start;
  const flush = () => {
    if (run.length) steps.push(moveStep(run, unit));
    run = [];
  };
  for (const leg of route.legs) {
    if (run.length && run[0].kind !== leg.kind) flush();
    run.push(leg);
    const endM = leg.startM + leg.lengthM;
    while (s < route.swaps.length && route.swaps[s].atM <= endM + EPS_M) {
      flush();
      steps.push(swapStep(route.swaps[s], s + 1, anchor, unit));
      anchor = route.swaps[s].node;
      s++;
    }
  }
  flush();
  steps.push({
    kind: 'arrive',
    text: `Arrive at ${end}`,
    detail: `${formatLength(route.lengthM, unit)}, ${route.swapCount} tether swap${route.swapCount === 1 ? '' : 's'}, ${formatDuration(route.totalSeconds)} in all.`,
    nodeKey: end,
  });
  return steps;
}
