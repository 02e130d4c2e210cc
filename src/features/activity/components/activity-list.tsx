import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { formatDateTime } from '@/lib/format';
import { useActivity } from '../api/get-activity';

export function ActivityList({ limit = 12 }: { limit?: number }) {
  const { data, isPending, isError } = useActivity(limit);
  if (isPending) return <Spinner />;
  if (isError) return <EmptyState>Recent activity could not be loaded.</EmptyState>;
  if (data.length === 0) return <EmptyState>Nothing has happened yet.</EmptyState>;
  return (
    <ol className="divide-y divide-surface-line text-sm" aria-label="Recent activity">
      {data.map((entry) => (
        <li key={entry.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2">
          {entry.link ? (
            <Link
              to={entry.link}
              className="rounded-sm text-text hover:underline focus-visible:outline-2 focus-visible:outline-accent focus-visible:outline-offset-2"
            >
              {entry.summary}
            </Link>
          ) : (
            <span>{entry.summary}</span>
          )}
          <time dateTime={entry.createdAt} className="text-xs text-text-muted">
            {formatDateTime(entry.createdAt)}
          </time>
        </li>
      ))}
    </ol>
  );
}
