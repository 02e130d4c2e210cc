import type { ReactNode } from 'react';
import { pointInHazard, segmentIntersectsHazard } from '@shared/compute/geometry';
import { formatLength, metresToFeet } from '@shared/compute/units';
import type { Hazard, StationNode, Vec3 } from '@shared/schemas/station';
import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/card';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { edgeAt, graphArraysOf, nodeAt, nodeIndexOf } from '@shared/compute/graph-columns';
import {
  edgeIndexOfKey,
  edgeKey,
  edgesOf,
  positionAt,
  type SelectionViewProps,
  type StationSelection,
} from './selection';

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

/** The hazards the edge's straight line between its ends passes through. */
function edgeHazards(graph: StationGraph, edge: GraphEdge): Hazard[] {
  const arrays = graphArraysOf(graph);
  const index = nodeIndexOf(arrays);
  const [a, b] = [index.get(edge.from), index.get(edge.to)];
  if (a === undefined || b === undefined) return [];
  const [pa, pb] = [positionAt(arrays, a), positionAt(arrays, b)];
  return graph.hazards.filter((h) => segmentIntersectsHazard(pa, pb, h));
}

/** The nodes inside a hazard and the edges through it, counted over the arrays. */
function hazardCounts(graph: StationGraph, hazard: Hazard) {
  const { positions: p, edgeFrom, edgeTo } = graphArraysOf(graph);
  const [a, b]: Vec3[] = [
    [0, 0, 0],
    [0, 0, 0],
  ];
  const at = (v: Vec3, i: number) => {
    v[0] = p[i * 3];
    v[1] = p[i * 3 + 1];
    v[2] = p[i * 3 + 2];
    return v;
  };
  let nodesInside = 0;
  for (let i = 0; i < p.length / 3; i++) if (pointInHazard(at(a, i), hazard)) nodesInside++;
  let edgesThrough = 0;
  for (let e = 0; e < edgeFrom.length; e++)
    if (segmentIntersectsHazard(at(a, edgeFrom[e]), at(b, edgeTo[e]), hazard)) edgesThrough++;
  return { nodesInside, edgesThrough };
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
  const { nodesInside, edgesThrough } = hazardCounts(graph, hazard);
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
      <Row label="Nodes inside">{nodesInside}</Row>
      <Row label="Edges through">{edgesThrough}</Row>
    </dl>
  );
}

/** The details of what is selected, read from the graph's arrays: no object per node or edge. */
export function SelectionDetails({ graph, selection, onSelect }: SelectionViewProps) {
  const arrays = graphArraysOf(graph);
  if (selection?.type === 'node') {
    const i = nodeIndexOf(arrays).get(selection.key);
    if (i !== undefined) return <NodeDetails graph={graph} node={nodeAt(graph, i)} onSelect={onSelect} />;
  }
  if (selection?.type === 'edge') {
    const e = edgeIndexOfKey(arrays, selection.key);
    if (e >= 0) return <EdgeDetails graph={graph} edge={edgeAt(graph, e)} onSelect={onSelect} />;
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
