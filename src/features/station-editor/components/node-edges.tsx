import type { GraphEdge } from '@shared/schemas/station-edits';
import { formatLength } from '@shared/compute/units';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import type { StationEdit } from '../api/edit-station';
import { describeEdge, edgesOfNode } from '../utils/node-keys';

interface NodeEdgesProps {
  nodeKey: string;
  edges: readonly GraphEdge[];
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
}

/** The selected node's edges, each with close/open and disconnect. */
export function NodeEdges({ nodeKey, edges, isSaving, onSubmit }: NodeEdgesProps) {
  const mine = edgesOfNode(edges, nodeKey);
  if (!mine.length) return <EmptyState>No edges yet: connect this node below.</EmptyState>;
  return (
    <ul className="divide-y divide-surface-line" aria-label={`Edges of ${nodeKey}`}>
      {mine.map((e) => {
        const other = e.from === nodeKey ? e.to : e.from;
        const name = describeEdge(e);
        return (
          <li key={e.id} className="flex flex-wrap items-center gap-2 py-2 text-sm">
            <span className="min-w-0 flex-1">
              <span className="font-mono">{other}</span> · {e.kind} · {formatLength(e.lengthM)} (
              {formatLength(e.lengthM, 'ft')}){e.lengthGiven ? ', given' : ''}
            </span>
            {e.closed && <Badge tone="caution">closed</Badge>}
            <Button
              size="sm"
              variant="secondary"
              disabled={isSaving}
              aria-label={`${e.closed ? 'Open' : 'Close'} edge ${name}`}
              onClick={() =>
                onSubmit({ type: 'update-edge', edgeId: e.id, name, edge: { closed: !e.closed } })
              }
            >
              {e.closed ? 'Open' : 'Close'}
            </Button>
            <Button
              size="sm"
              variant="ghost"
              disabled={isSaving}
              aria-label={`Disconnect ${name}`}
              onClick={() => onSubmit({ type: 'delete-edge', edgeId: e.id, name })}
            >
              Disconnect
            </Button>
          </li>
        );
      })}
    </ul>
  );
}
