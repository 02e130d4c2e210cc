import type { WalkthroughSummary } from '@shared/schemas/walkthrough';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/card';
import { Table, Td, Th } from '@/components/ui/table';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { formatDateTime } from '@/lib/format';

export function WalkthroughsTable({ walkthroughs }: { walkthroughs: readonly WalkthroughSummary[] }) {
  if (walkthroughs.length === 0) return <EmptyState>No walkthroughs saved yet.</EmptyState>;
  return (
    <Table caption="Saved walkthroughs">
      <thead>
        <tr>
          <Th>Name</Th>
          <Th>Rehearses</Th>
          <Th>Station</Th>
          <Th>Notes</Th>
          <Th>Saved by</Th>
          <Th>Updated</Th>
        </tr>
      </thead>
      <tbody>
        {walkthroughs.map((w) => (
          <tr key={w.id}>
            <Td>
              <TextLink to={paths.walkthrough.getHref(w.id)}>{w.name}</TextLink>
            </Td>
            <Td>
              <span className="flex flex-wrap items-center gap-2">
                {w.plan ? <>Plan “{w.plan.title}”</> : <>Route {w.routeSummary}</>}
                {w.stale && <Badge tone="caution">{w.plan ? 'plan' : 'station'} changed since</Badge>}
              </span>
            </Td>
            <Td>{w.stationName}</Td>
            <Td className="tabular-nums">{w.noteCount}</Td>
            <Td>{w.authorName ?? '—'}</Td>
            <Td className="whitespace-nowrap">{formatDateTime(w.updatedAt)}</Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
