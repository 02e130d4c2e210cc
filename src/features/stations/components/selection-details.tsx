import type { ReactNode } from 'react';
import { pointInHazard, segmentIntersectsHazard } from '@shared/compute/geometry';
import { formatLength, metresToFeet } from '@shared/compute/units';
import type { Hazard, StationNode, Vec3 } from '@shared/schemas/station';
import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/card';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { edgeKey, edgesOf, type SelectionViewProps, type StationSelection } from './selection';

const fmt = (v: number) => v.toFixed(2);
const vec = (v: Vec3) => `(${v.map(fmt).join(', ')})`;
const vecFeet = (v: Vec3) => `(${v.map((x) => metresToFeet(x).toFixed(2)).join(', ')})`;
const bothUnits = (m: number) => `${formatLength(m, 'm', 2)} (${formatLength(m, 'ft', 1)})`;

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[7.5rem_1fr] gap-2 py-1.5 text-sm">
      <dt className="text-text-muted">{label}</dt>
      <dd className="min-w-0 break-words text-text-strong">{children}</dd>
    </div>
  );
}

function LinkButton({ onClick, children }: { onClick: () => void; children: ReactNode }) {
  return (
    <button
      type="button"
      onClick={onClick}
      className={cn(
        'rounded-sm font-mono text-accent underline underline-offset-2 hover:text-accent-strong',
        focusRing,
      )}
    >
      {children}
    </button>
  );
}

function hazardTone(h: Hazard) {
  return h.kind === 'keep-out' ? 'danger' : 'caution';
}

function HazardList({ hazards, onSelect }: { hazards: Hazard[]; onSelect: (s: StationSelection) => void }) {
  if (hazards.length === 0) return <span className="text-text-muted">none</span>;
  return (
    <ul className="space-y-1">
      {hazards.map((h) => (
        <li key={h.key} className="flex items-center gap-2">
          <LinkButton onClick={() => onSelect({ type: 'hazard', key: h.key })}>{h.key}</LinkButton>
          <Badge tone={hazardTone(h)}>{h.kind}</Badge>
          {h.label && <span className="text-text-muted">{h.label}</span>}
        </li>
      ))}
    </ul>
  );
}

const positionsOf = new WeakMap<StationGraph, Map<string, Vec3>>();

/** Each node's position by key, made once per graph. */
function positions(graph: StationGraph): Map<string, Vec3> {
  let made = positionsOf.get(graph);
  if (!made) positionsOf.set(graph, (made = new Map(graph.nodes.map((n) => [n.key, n.position]))));
  return made;
}

function edgeHazards(graph: StationGraph, edge: GraphEdge): Hazard[] {
  const at = positions(graph);
  const a = at.get(edge.from);
  const b = at.get(edge.to);
  return a && b ? graph.hazards.filter((h) => segmentIntersectsHazard(a, b, h)) : [];
}

function NodeDetails({
  graph,
  node,
  onSelect,
}: {
  graph: StationGraph;
  node: StationNode;
  onSelect: (s: StationSelection) => void;
}) {
  const edges = edgesOf(graph, node.key);
  const inside = graph.hazards.filter((h) => pointInHazard(node.position, h));
  const crossed = [...new Set(edges.flatMap((e) => edgeHazards(graph, e)))].filter(
    (h) => !inside.includes(h),
  );
  return (
    <dl>
      <Row label="Key">
        <span className="font-mono font-semibold">{node.key}</span>
      </Row>
      <Row label="Kind">
        <Badge tone="accent">{node.kind}</Badge>
      </Row>
      <Row label="Label">{node.label ?? <span className="text-text-muted">—</span>}</Row>
      <Row label="Position (m)">
        <span className="font-mono">{vec(node.position)}</span>
      </Row>
      <Row label="Position (ft)">
        <span className="font-mono">{vecFeet(node.position)}</span>
      </Row>
      <Row label="Normal">
        {node.normal ? (
          <span className="font-mono">{vec(node.normal)}</span>
        ) : (
          <span className="text-text-muted">—</span>
        )}
      </Row>
      <Row label="Notes">{node.notes ?? <span className="text-text-muted">—</span>}</Row>
      <Row label={`Edges (${edges.length})`}>
        {edges.length === 0 ? (
          <span className="text-text-muted">none: this node is not connected</span>
        ) : (
          <ul className="space-y-1">
            {edges.map((e) => {
              const other = e.from === node.key ? e.to : e.from;
              return (
                <li key={e.id} className="flex flex-wrap items-center gap-x-2">
                  <LinkButton onClick={() => onSelect({ type: 'node', key: other })}>{other}</LinkButton>
                  <span className="text-text-muted">
                    {e.kind}, {bothUnits(e.lengthM)}
                    {e.closed && ', closed'}
                  </span>
                  <LinkButton onClick={() => onSelect({ type: 'edge', key: edgeKey(e) })}>edge</LinkButton>
                </li>
              );
            })}
          </ul>
        )}
      </Row>
      <Row label="Inside hazards">
        <HazardList hazards={inside} onSelect={onSelect} />
      </Row>
      <Row label="Edges cross">
        <HazardList hazards={crossed} onSelect={onSelect} />
      </Row>
    </dl>
  );
}

function EdgeDetails({
  graph,
  edge,
  onSelect,
}: {
  graph: StationGraph;
  edge: GraphEdge;
  onSelect: (s: StationSelection) => void;
}) {
  return (
    <dl>
      <Row label="Edge">
        <LinkButton onClick={() => onSelect({ type: 'node', key: edge.from })}>{edge.from}</LinkButton>
        <span className="mx-1.5 text-text-muted">↔</span>
        <LinkButton onClick={() => onSelect({ type: 'node', key: edge.to })}>{edge.to}</LinkButton>
      </Row>
      <Row label="Kind">
        <Badge tone="accent">{edge.kind}</Badge>
        {edge.closed && (
          <span className="ml-2">
            <Badge tone="danger">closed</Badge>
          </span>
        )}
      </Row>
      <Row label="Length">
        {bothUnits(edge.lengthM)}{' '}
        <span className="text-text-muted">({edge.lengthGiven ? 'given' : 'from the node positions'})</span>
      </Row>
      <Row label="Label">{edge.label ?? <span className="text-text-muted">—</span>}</Row>
      <Row label="Crosses hazards">
        <HazardList hazards={edgeHazards(graph, edge)} onSelect={onSelect} />
      </Row>
    </dl>
  );
}

function HazardDetails({ graph, hazard }: { graph: StationGraph; hazard: Hazard }) {
  const nodesInside = graph.nodes.filter((n) => pointInHazard(n.position, hazard));
  const edgesThrough = graph.edges.filter((e) => edgeHazards(graph, e).includes(hazard));
  return (
    <dl>
      <Row label="Key">
        <span className="font-mono font-semibold">{hazard.key}</span>
      </Row>
      <Row label="Kind">
        <Badge tone={hazardTone(hazard)}>{hazard.kind}</Badge>
        <span className="ml-2 text-text-muted">
          {hazard.kind === 'keep-out' ? 'no route may pass through it' : 'routes through it carry a warning'}
        </span>
      </Row>
      <Row label="Label">{hazard.label ?? <span className="text-text-muted">—</span>}</Row>
      {hazard.shape === 'sphere' ? (
        <>
          <Row label="Centre (m)">
            <span className="font-mono">{vec(hazard.center)}</span>
          </Row>
          <Row label="Radius">{bothUnits(hazard.radiusM)}</Row>
        </>
      ) : (
        <>
          <Row label="Min (m)">
            <span className="font-mono">{vec(hazard.min)}</span>
          </Row>
          <Row label="Max (m)">
            <span className="font-mono">{vec(hazard.max)}</span>
          </Row>
        </>
      )}
      <Row label="Nodes inside">{nodesInside.length}</Row>
      <Row label="Edges through">{edgesThrough.length}</Row>
    </dl>
  );
}

export function SelectionDetails({ graph, selection, onSelect }: SelectionViewProps) {
  if (selection?.type === 'node') {
    const node = graph.nodes.find((n) => n.key === selection.key);
    if (node) return <NodeDetails graph={graph} node={node} onSelect={onSelect} />;
  }
  if (selection?.type === 'edge') {
    const edge = graph.edges.find((e) => edgeKey(e) === selection.key);
    if (edge) return <EdgeDetails graph={graph} edge={edge} onSelect={onSelect} />;
  }
  if (selection?.type === 'hazard') {
    const hazard = graph.hazards.find((h) => h.key === selection.key);
    if (hazard) return <HazardDetails graph={graph} hazard={hazard} />;
  }
  return (
    <EmptyState>
      Nothing selected. Click a glyph in the 3D view, choose a node from the list (arrow keys and Enter), or
      pick a row in the tables.
    </EmptyState>
  );
}
