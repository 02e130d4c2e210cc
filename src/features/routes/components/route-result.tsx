import type { RouteFeasible, RouteInfeasible } from '@shared/schemas/route';
import { restateLengths, type LengthUnit } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { cn } from '@/lib/cn';
import { formatBothLengths, formatDuration } from '../lib/format-route';
import { reasonTitle } from '../lib/route-overlay';
import { routeSteps, type RouteStepKind } from '../lib/route-steps';

const STEP_TAGS: Record<RouteStepKind, string> = {
  start: 'Start',
  handrail: 'Translate',
  hop: 'Hop',
  ride: 'Arm ride',
  swap: 'Swap',
  arrive: 'Arrive',
};

function Summary({ route, unit }: { route: RouteFeasible; unit: LengthUnit }) {
  const items: [string, string][] = [
    ['Length', formatBothLengths(route.lengthM, unit)],
    ['Travel time', formatDuration(route.travelSeconds)],
    ['Tether swaps', `${route.swapCount} (${formatDuration(route.swapSeconds)})`],
    ['Total time', formatDuration(route.totalSeconds)],
    [
      'Most tether out',
      `${formatBothLengths(route.maxPaidOutM, unit)} of ${formatBothLengths(route.tetherLengthM, unit)}`,
    ],
  ];
  return (
    <dl aria-label="Route summary" className="grid grid-cols-2 gap-x-4 gap-y-2 text-sm">
      {items.map(([term, value]) => (
        <div key={term} className={cn(term === 'Most tether out' && 'col-span-2')}>
          <dt className="text-xs text-text-muted">{term}</dt>
          <dd className="font-semibold text-text-strong tabular-nums">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

export function RouteSteps({
  route,
  unit,
  onFocusNode,
}: {
  route: RouteFeasible;
  unit: LengthUnit;
  onFocusNode?: (key: string) => void;
}) {
  const steps = routeSteps(route, unit);
  return (
    <ol aria-label="Route steps" className="space-y-2">
      {steps.map((step, i) => (
        <li
          key={i}
          className={cn(
            'rounded-md border px-3 py-2 text-sm',
            step.kind === 'swap'
              ? 'border-caution/50 bg-caution-soft'
              : 'border-surface-line bg-surface-panel',
          )}
        >
          <div className="flex items-baseline gap-2">
            <span className="w-5 shrink-0 text-right text-xs text-text-muted tabular-nums">{i + 1}.</span>
            <Badge tone={step.kind === 'swap' ? 'caution' : 'neutral'}>
              {STEP_TAGS[step.kind]}
              {step.swapNumber !== undefined ? ` ${step.swapNumber}` : ''}
            </Badge>
            {onFocusNode ? (
              <button
                type="button"
                onClick={() => onFocusNode(step.nodeKey)}
                className="text-left font-medium text-text-strong hover:underline focus-visible:outline-2 focus-visible:outline-accent"
              >
                {step.text}
              </button>
            ) : (
              <span className="font-medium text-text-strong">{step.text}</span>
            )}
          </div>
          {step.detail && <p className="mt-0.5 pl-7 text-xs text-text-muted">{step.detail}</p>}
        </li>
      ))}
    </ol>
  );
}

export function RouteFeasibleView({
  route,
  unit,
  onFocusNode,
}: {
  route: RouteFeasible;
  unit: LengthUnit;
  onFocusNode?: (key: string) => void;
}) {
  return (
    <div className="space-y-4">
      <Summary route={route} unit={unit} />
      {route.warnings.length > 0 && (
        <Alert tone="caution" title="Warnings">
          <ul className="list-disc space-y-0.5 pl-4">
            {route.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Alert>
      )}
      <RouteSteps route={route} unit={unit} onFocusNode={onFocusNode} />
    </div>
  );
}

/** Why there is no route, its lengths in the unit the tether was asked in. */
export function RouteInfeasibleView({ route, unit = 'm' }: { route: RouteInfeasible; unit?: LengthUnit }) {
  return (
    <Alert tone="danger" title={`No route: ${reasonTitle(route).toLowerCase()}`}>
      <p>{restateLengths(route.reason, unit)}</p>
      {route.blockingHazards?.length ? (
        <p className="mt-1">Blocking: {route.blockingHazards.join(', ')}.</p>
      ) : null}
    </Alert>
  );
}
