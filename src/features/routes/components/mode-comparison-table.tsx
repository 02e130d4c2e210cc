import { ROUTE_MODES, type RouteMode, type RouteResult } from '@shared/schemas/route';
import { formatLength, type LengthUnit } from '@shared/compute/units';
import { Table, Td, Th } from '@/components/ui/table';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { formatDuration } from '../lib/format-route';
import {
  allModesAgree,
  bestPerColumn,
  formatMinSec,
  COMPARISON_COLUMNS,
  MODE_LABELS,
  type ComparisonColumn,
} from '../lib/mode-comparison';

const HEADINGS: Record<ComparisonColumn, string> = {
  lengthM: 'Length',
  travelSeconds: 'Travel min',
  swapCount: 'Swaps',
  totalSeconds: 'Total min',
};

const cellPad = 'px-1.5';

interface ModeComparisonTableProps {
  results: Partial<Record<RouteMode, RouteResult | undefined>>;
  chosen: RouteMode;
  unit: LengthUnit;
  onChoose: (mode: RouteMode) => void;
}

/**
 * The three modes side by side, narrow enough for a side panel (times as m:ss); the chosen row and the
 * best value of a column are marked in words too, and only where the modes differ in that column.
 * When all three give the same route, one sentence says so instead.
 */
export function ModeComparisonTable({ results, chosen, unit, onChoose }: ModeComparisonTableProps) {
  const best = bestPerColumn(results);
  const cell = (r: RouteResult | undefined, column: ComparisonColumn): string => {
    if (!r) return '…';
    if (!r.feasible) return '–';
    if (column === 'lengthM') return formatLength(r.lengthM, unit);
    if (column === 'swapCount') return String(r.swapCount);
    return formatMinSec(r[column]);
  };
  const same = results.fastest;
  if (allModesAgree(results) && same?.feasible)
    return (
      <p className="text-sm text-text" data-testid="modes-agree">
        All three modes give the same route: {formatLength(same.lengthM, unit)},{' '}
        {formatDuration(same.travelSeconds)} of travel, {same.swapCount} swap{same.swapCount === 1 ? '' : 's'}
        , {formatDuration(same.totalSeconds)} in all.
      </p>
    );
  const feasibleCount = ROUTE_MODES.filter((m) => results[m]?.feasible).length;
  return (
    <Table caption="The three route modes compared; the chosen mode is marked, and the best value of each column">
      <thead>
        <tr>
          <Th className={cellPad}>Mode</Th>
          {COMPARISON_COLUMNS.map((c) => (
            <Th key={c} className={cn(cellPad, 'text-right')}>
              {HEADINGS[c]}
            </Th>
          ))}
        </tr>
      </thead>
      <tbody>
        {ROUTE_MODES.map((mode) => {
          const r = results[mode];
          const isChosen = mode === chosen;
          return (
            <tr
              key={mode}
              aria-current={isChosen ? 'true' : undefined}
              className={cn(isChosen && 'bg-accent-soft')}
            >
              <Td className={cn(cellPad, isChosen && 'border-l-4 border-l-accent')}>
                <button
                  type="button"
                  onClick={() => onChoose(mode)}
                  className={cn(
                    'rounded text-left font-medium text-text-strong underline-offset-2 hover:underline',
                    focusRing,
                  )}
                >
                  {MODE_LABELS[mode]}
                </button>
                {isChosen && (
                  <span className="ml-1 text-xs font-semibold text-accent-strong">
                    <span aria-hidden="true">✓</span>
                    <span className="sr-only">(chosen)</span>
                  </span>
                )}
              </Td>
              {COMPARISON_COLUMNS.map((c) => {
                // a column where every mode is as good marks none of them
                const isBest = best[c].includes(mode) && best[c].length < feasibleCount;
                return (
                  <Td
                    key={c}
                    className={cn(
                      cellPad,
                      'text-right whitespace-nowrap tabular-nums',
                      isBest && 'font-semibold text-text-strong',
                    )}
                  >
                    {cell(r, c)}
                    {isBest && (
                      <span className="ml-0.5 text-accent-strong" title="best in this column">
                        <span aria-hidden="true">★</span>
                        <span className="sr-only"> (best)</span>
                      </span>
                    )}
                  </Td>
                );
              })}
            </tr>
          );
        })}
      </tbody>
    </Table>
  );
}
