import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { PLAN_STATUSES, type PlanStatus } from '@shared/schemas/plan';
import { focusRing } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Table, Td, Th } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import type { PlanListItem } from '../types';
import { PlanStatusBadge, STATUS_LABELS } from './plan-status-badge';

const ALL = '';

/** Every plan, narrowed in the page by status, station, author and title; newest change first. */
export function PlansList({ plans }: { plans: PlanListItem[] }) {
  const [status, setStatus] = useState<PlanStatus | typeof ALL>(ALL);
  const [station, setStation] = useState(ALL);
  const [author, setAuthor] = useState(ALL);
  const [search, setSearch] = useState('');

  const option = (values: string[], all: string) => [
    { value: ALL, label: all },
    ...[...new Set(values)].sort().map((v) => ({ value: v, label: v })),
  ];
  const stationOptions = option(
    plans.map((p) => p.stationName),
    'All stations',
  );
  const authorOptions = option(
    plans.flatMap((p) => (p.authorName ? [p.authorName] : [])),
    'Everyone',
  );
  const counts = useMemo(() => {
    const c: Record<PlanStatus, number> = { draft: 0, 'in-review': 0, approved: 0 };
    for (const p of plans) c[p.status]++;
    return c;
  }, [plans]);

  const needle = search.trim().toLowerCase();
  const shown = plans.filter(
    (p) =>
      (status === ALL || p.status === status) &&
      (station === ALL || p.stationName === station) &&
      (author === ALL || p.authorName === author) &&
      (!needle || p.title.toLowerCase().includes(needle)),
  );

  return (
    <div className="space-y-4">
      <div role="group" aria-label="Status" className="flex flex-wrap gap-2">
        {[ALL, ...PLAN_STATUSES].map((s) => (
          <button
            key={s || 'all'}
            type="button"
            aria-pressed={status === s}
            onClick={() => setStatus(s as PlanStatus | typeof ALL)}
            className={cn(
              'rounded-full border px-3 py-1 text-sm font-medium',
              focusRing,
              status === s
                ? 'border-accent bg-accent-soft text-accent-strong'
                : 'border-surface-line bg-surface-panel text-text-strong hover:bg-surface-sunken',
            )}
          >
            {s === ALL
              ? `All (${plans.length})`
              : `${STATUS_LABELS[s as PlanStatus]} (${counts[s as PlanStatus]})`}
          </button>
        ))}
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Title contains">
          <Input type="search" value={search} onChange={(e) => setSearch(e.target.value)} />
        </Field>
        <Field label="Station">
          <Select options={stationOptions} value={station} onChange={(e) => setStation(e.target.value)} />
        </Field>
        <Field label="Author">
          <Select options={authorOptions} value={author} onChange={(e) => setAuthor(e.target.value)} />
        </Field>
      </div>
      {shown.length === 0 ? (
        <EmptyState>{plans.length === 0 ? 'No plans yet.' : 'No plan matches these filters.'}</EmptyState>
      ) : (
        <Table caption="Plans">
          <thead>
            <tr>
              <Th>Plan</Th>
              <Th>Status</Th>
              <Th>Station</Th>
              <Th>EVA date</Th>
              <Th>Author</Th>
              <Th>Updated</Th>
            </tr>
          </thead>
          <tbody>
            {shown.map((p) => (
              <tr key={p.id}>
                <Td>
                  <Link
                    to={paths.plan.getHref(p.id)}
                    className={cn(
                      'rounded-sm font-medium text-accent underline underline-offset-2',
                      focusRing,
                    )}
                  >
                    {p.title}
                  </Link>
                  <span className="ml-2 text-xs text-text-muted">v{p.version}</span>
                </Td>
                <Td>
                  <PlanStatusBadge status={p.status} />
                </Td>
                <Td>{p.stationName}</Td>
                <Td>{p.date}</Td>
                <Td>{p.authorName ?? '—'}</Td>
                <Td>{formatDateTime(p.updatedAt)}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}
