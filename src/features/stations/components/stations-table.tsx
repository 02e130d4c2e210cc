import type { StationSummary } from '@shared/schemas/station-edits';
import { Table, Td, Th } from '@/components/ui/table';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { formatDateTime } from '@/lib/format';

export function StationsTable({ stations }: { stations: StationSummary[] }) {
  return (
    <Table caption="Stations">
      <thead>
        <tr>
          <Th>Station</Th>
          <Th className="text-right">Version</Th>
          <Th className="text-right">Nodes</Th>
          <Th className="text-right">Edges</Th>
          <Th className="text-right">Hazards</Th>
          <Th className="text-right">Segments</Th>
          <Th>Updated</Th>
        </tr>
      </thead>
      <tbody>
        {stations.map((s) => (
          <tr key={s.id} data-testid={`station-row-${s.id}`}>
            <Td>
              <TextLink to={paths.station.getHref(s.id)}>{s.name}</TextLink>
            </Td>
            <Td className="text-right tabular-nums">v{s.version}</Td>
            <Td className="text-right tabular-nums">{s.counts.nodes}</Td>
            <Td className="text-right tabular-nums">{s.counts.edges}</Td>
            <Td className="text-right tabular-nums">{s.counts.hazards}</Td>
            <Td className="text-right tabular-nums">{s.counts.segments}</Td>
            <Td className="text-text-muted">
              {formatDateTime(s.updatedAt)}
              {s.updatedBy && <span> by {s.updatedBy.name}</span>}
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
