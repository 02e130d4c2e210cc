import type { RouteMode } from '@shared/schemas/route';

export const ROUTE_MODE_LABELS: Record<RouteMode, string> = {
  fastest: 'Fastest',
  'fewest-swaps': 'Fewest tether swaps',
  balanced: 'Balanced (time with swap cost)',
};
