import { describe, expect, it } from 'vitest';
import { screen } from '@testing-library/react';
import type { SeriesListItem } from '@shared/schemas/series';
import { PlanSeriesLine } from '@/features/series/components/plan-series-line';
import { seriesKeys } from '@/features/series/api/get-series';
import { createQueryClient } from '@/lib/query-client';
import { renderInDataRouter } from '../setup/client';

const list: SeriesListItem[] = [
  {
    id: 4,
    title: 'Pump swap, three EVAs',
    version: 2,
    planIds: [7, 3, 9],
    updatedAt: '2031-01-02T00:00:00Z',
  },
  { id: 5, title: 'Camera boom', version: 1, planIds: [11], updatedAt: '2031-01-01T00:00:00Z' },
];

function renderFor(planId: number) {
  const queryClient = createQueryClient();
  queryClient.setQueryData(seriesKeys.lists(), list);
  return renderInDataRouter(<PlanSeriesLine planId={planId} />, queryClient);
}

describe('the plan screen names the series a plan is an EVA of', () => {
  it('says which EVA of how many, linked to the series', () => {
    renderFor(3);
    expect(screen.getByTestId('plan-series').textContent).toBe('EVA 2 of 3 in Pump swap, three EVAs');
    expect(screen.getByRole('link', { name: 'Pump swap, three EVAs' }).getAttribute('href')).toBe(
      '/series/4',
    );
  });

  it('says nothing for a plan in no series', () => {
    renderFor(8);
    expect(screen.queryByTestId('plan-series')).toBeNull();
  });
});
