import { ROUTE_MODES, type RouteMode, type RouteResult } from '@shared/schemas/route';
import { formatLength, type LengthUnit } from '@shared/compute/units';
import { Table, Td, Th } from '@/components/ui/table';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { formatDuration } from '../lib/format-route';
import {
  bestPerColumn,
  COMPARISON_COLUMNS,
  MODE_LABELS,
  type ComparisonColumn,
} from '../lib/mode-comparison';

const HEADINGS: Record<ComparisonColumn, string> = {
  lengthM: 'Length',
  travelSeconds: 'Travel',
  swapCount: 'Swaps',
  totalSeconds: 'Total',
};

interface ModeComparisonTableProps {
  results: Partial<Record<RouteMode, RouteResult | undefined>>;
  chosen: RouteMode;
  unit: LengthUnit;
  onChoose: (mode: RouteMode) => void;
}

/** The three modes side by side; the chosen row and the best value of each column are marked in words too. */
export function ModeComparisonTable({ results, chosen, unit, onChoose }: ModeComparisonTableProps) {
  const best = bestPerColumn(results);
  const cell = (r: RouteResult | undefined, column: ComparisonColumn): string => {
    if (!r) return '…';
    if (!r.feasible) return '–';
    if (column === 'lengthM') return formatLength(r.lengthM, unit);
    if (column === 'swapCount') return String(r.swapCount);
    return formatDuration(r[column]);
  };
  return (
    <Table caption="The three route modes compared; the chosen mode is marked, and the best value of each column">
      <thead>
        <tr>
          <Th>Mode</Th>
          {COMPARISON_COLUMNS.map((c) => (
            <Th key={c} className="text-right">
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
              <Td className={cn(isChosen && 'border-l-4 border-l-accent')}>
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
                  <span className="ml-1.5 text-xs font-semibold text-accent-strong">(chosen)</span>
                )}
              </Td>
              {COMPARISON_COLUMNS.map((c) => {
                const isBest = best[c].includes(mode);
                return (
                  <Td
                    key={c}
                    className={cn('text-right tabular-nums', isBest && 'font-semibold text-text-strong')}
                  >
                    {cell(r, c)}
                    {isBest && (
                      <span className="ml-1 text-accent-strong" title="best in this column">
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
