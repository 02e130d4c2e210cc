import { UndirectedGraph } from 'graphology';
import type { EdgeKind, NodeKind, StationDocument, Vec3 } from '../schemas/station';
import { dist, segmentIntersectsHazard } from './geometry';

export interface StationNodeAttributes {
  kind: NodeKind;
  position: Vec3;
  label?: string;
}

export interface StationEdgeAttributes {
  kind: EdgeKind;
  lengthM: number;
  closed: boolean;
  /** keys of keep-out hazards the edge's straight segment passes through */
  keepOut: string[];
  caution: string[];
}

export type StationGraph = UndirectedGraph<StationNodeAttributes, StationEdgeAttributes>;

/**
 * The station as a graphology graph: the model layer for validation, components, hazards and edits.
 * Route queries use the compiled typed-array index instead (compiled-station.ts).
 */
export function buildStationGraph(doc: StationDocument): StationGraph {
  const g: StationGraph = new UndirectedGraph({ multi: true, allowSelfLoops: false });
  for (const n of doc.nodes) {
    g.addNode(n.key, { kind: n.kind, position: n.position, ...(n.label ? { label: n.label } : {}) });
  }
  doc.edges.forEach((e, i) => {
    const a = g.getNodeAttribute(e.from, 'position');
    const b = g.getNodeAttribute(e.to, 'position');
    const keepOut: string[] = [];
    const caution: string[] = [];
    for (const h of doc.hazards) {
      if (segmentIntersectsHazard(a, b, h)) (h.kind === 'keep-out' ? keepOut : caution).push(h.key);
    }
    g.addEdgeWithKey(`e${i}`, e.from, e.to, {
      kind: e.kind,
      lengthM: e.lengthM ?? dist(a, b),
      closed: e.closed ?? false,
      keepOut,
      caution,
    });
  });
  return g;
}

/**
 * Connected components (node keys), largest first, by breadth-first search. `usable` filters
 * edges, e.g. to ask what stays connected once closed and keep-out edges are removed.
 */
export function connectedComponents(
  g: StationGraph,
  usable: (attrs: StationEdgeAttributes) => boolean = () => true,
): string[][] {
  const seen = new Set<string>();
  const components: string[][] = [];
  g.forEachNode((start) => {
    if (seen.has(start)) return;
    seen.add(start);
    const component = [start];
    for (let i = 0; i < component.length; i++) {
      g.forEachEdge(component[i], (_e, attrs, source, target) => {
        if (!usable(attrs)) return;
        const other = source === component[i] ? target : source;
        if (!seen.has(other)) {
          seen.add(other);
          component.push(other);
        }
      });
    }
    components.push(component);
  });
  return components.sort((a, b) => b.length - a.length);
}
