import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { getSeriesListQueryOptions } from '../api/get-series';

/** The series a plan is an EVA of, as "EVA 2 of 3 in <series>", linked; nothing for a plan in none. */
export function PlanSeriesLine({ planId }: { planId: number }) {
  const list = useQuery(getSeriesListQueryOptions());
  const series = list.data?.find((s) => s.planIds.includes(planId));
  if (!series) return null;
  return (
    <p className="text-sm text-text-muted" data-testid="plan-series">
      EVA {series.planIds.indexOf(planId) + 1} of {series.planIds.length} in{' '}
      <Link className="font-medium text-accent-strong underline" to={paths.series.getHref(series.id)}>
        {series.title}
      </Link>
    </p>
  );
}
