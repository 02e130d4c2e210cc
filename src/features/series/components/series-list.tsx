import { Link } from 'react-router-dom';
import type { SeriesListItem } from '@shared/schemas/series';
import { EmptyState } from '@/components/ui/card';
import { paths } from '@/config/paths';

/** The EVA series: each a link to its strip. */
export function SeriesList({ series }: { series: SeriesListItem[] }) {
  if (!series.length)
    return <EmptyState>No series yet: EVAs that build on each other are planned as one.</EmptyState>;
  return (
    <ul className="divide-y divide-surface-line text-sm" aria-label="Series">
      {series.map((s) => (
        <li key={s.id} className="py-2">
          <Link className="font-semibold text-accent-strong underline" to={paths.series.getHref(s.id)}>
            {s.title}
          </Link>{' '}
          <span className="text-text-muted">
            ({s.planIds.length} EVA{s.planIds.length === 1 ? '' : 's'})
          </span>
        </li>
      ))}
    </ul>
  );
}
