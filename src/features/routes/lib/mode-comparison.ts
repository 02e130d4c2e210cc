import { ROUTE_MODES, type RouteMode, type RouteResult } from '@shared/schemas/route';

export const MODE_LABELS: Record<RouteMode, string> = {
  fastest: 'Fastest',
  'fewest-swaps': 'Fewest swaps',
  balanced: 'Balanced',
};

export const COMPARISON_COLUMNS = ['lengthM', 'travelSeconds', 'swapCount', 'totalSeconds'] as const;
export type ComparisonColumn = (typeof COMPARISON_COLUMNS)[number];

const TIE = 1e-6;

/** For each column, the modes whose feasible route has the least value (ties all count). */
export function bestPerColumn(
  results: Partial<Record<RouteMode, RouteResult | undefined>>,
): Record<ComparisonColumn, RouteMode[]> {
  const out = {} as Record<ComparisonColumn, RouteMode[]>;
  for (const column of COMPARISON_COLUMNS) {
    let least = Infinity;
    for (const mode of ROUTE_MODES) {
      const r = results[mode];
      if (r?.feasible) least = Math.min(least, r[column]);
    }
    out[column] = ROUTE_MODES.filter((mode) => {
      const r = results[mode];
      return r?.feasible === true && r[column] <= least + TIE * Math.max(1, Math.abs(least));
    });
  }
  return out;
}

/** All three modes answered with routes alike in every column: the comparison says so once. */
export function allModesAgree(results: Partial<Record<RouteMode, RouteResult | undefined>>): boolean {
  if (!ROUTE_MODES.every((m) => results[m]?.feasible)) return false;
  const best = bestPerColumn(results);
  return COMPARISON_COLUMNS.every((c) => best[c].length === ROUTE_MODES.length);
}

/** Minutes and seconds (`m:ss`, minutes past 59 too): the one format route times are compared in. */
export function formatMinSec(seconds: number): string {
  const whole = Math.round(seconds);
  return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')}`;
}
