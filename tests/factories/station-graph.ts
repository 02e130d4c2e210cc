import type { StationDocument } from '@shared/schemas/station';
import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';

/** The graph endpoint's summary of a stored `doc`. */
export function stationSummaryOf(
  doc: StationDocument,
  { id, version, at = '2026-12-05T10:00:00.000Z' }: { id: number; version: number; at?: string },
): StationGraph['station'] {
  return {
    id,
    name: doc.name,
    version,
    orbit: doc.orbit,
    settings: doc.settings,
    counts: {
      nodes: doc.nodes.length,
      edges: doc.edges.length,
      hazards: doc.hazards.length,
      segments: doc.segments.length,
    },
    createdAt: at,
    updatedAt: at,
    updatedBy: null,
  };
}

/** A graph as the graph endpoint answers it: ids rising with gaps, some lengths given, some edges closed or labelled. */
export function stationGraphOf(doc: StationDocument, seed: number): StationGraph {
  let s = seed;
  const next = () => (s = (s * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
  const at = new Map(doc.nodes.map((n) => [n.key, n.position]));
  let id = Math.floor(next() * 50);
  const edges: GraphEdge[] = doc.edges.map((e) => {
    id += 1 + Math.floor(next() * 3);
    const [a, b] = [at.get(e.from)!, at.get(e.to)!];
    const given = e.lengthM ?? (next() < 0.1 ? Math.round(next() * 1000) / 97 : undefined);
    const label = e.label ?? (next() < 0.05 ? `rail ${id}` : undefined);
    return {
      id,
      from: e.from,
      to: e.to,
      kind: e.kind,
      lengthM: given ?? Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]),
      lengthGiven: given !== undefined,
      closed: e.closed ?? next() < 0.05,
      ...(label === undefined ? {} : { label }),
    };
  });
  return {
    station: stationSummaryOf(doc, { id: 7, version: 3 }),
    segments: doc.segments,
    nodes: doc.nodes,
    edges,
    hazards: doc.hazards,
    arms: doc.arms,
  } as StationGraph;
}
