import { and, eq } from 'drizzle-orm';
import { edges, nodes, stations } from '../../db/schema';
import { badRequest } from '../../lib/http-error';
import { edgePairKey, parseStationDocument, type DocumentProblem } from '@shared/schemas/station';
import {
  mergeCsvIntoDocument,
  parseArmsCsv,
  parseEdgesCsv,
  parseNodesCsv,
} from '@shared/schemas/station-csv';
import {
  changeSince,
  edgeToRow,
  getStation,
  loadDocument,
  nodeToRow,
  problemsError,
  writeStation,
  type DbContext,
  isDryRun,
  type WriteRequest,
} from './stations.service';

export interface CsvFiles {
  nodes?: { text: string; name: string };
  edges?: { text: string; name: string };
  arms?: { text: string; name: string };
}

/**
 * Merges node and edge tables into a station (nodes upserted by key, edges by ends and kind), all or
 * nothing: any problem in either file, or in the merged model, and nothing is written.
 */
export function importStationCsv(ctx: DbContext, req: WriteRequest, files: CsvFiles) {
  if (!files.nodes && !files.edges && !files.arms) {
    throw badRequest(
      'Attach a nodes file, an edges file, an arms file or several (multipart fields "nodes", "edges" and "arms").',
    );
  }
  const names = {
    nodes: files.nodes?.name ?? 'nodes.csv',
    edges: files.edges?.name ?? 'edges.csv',
    arms: files.arms?.name ?? 'arms.csv',
  };
  const parsedNodes = files.nodes
    ? parseNodesCsv(files.nodes.text, names.nodes)
    : { rows: [], problems: [], unread: [] };
  const parsedEdges = files.edges ? parseEdgesCsv(files.edges.text, names.edges) : { rows: [], problems: [] };
  const parsedArms = files.arms ? parseArmsCsv(files.arms.text, names.arms) : { rows: [], problems: [] };
  const fileProblems: DocumentProblem[] = [
    ...parsedNodes.problems,
    ...parsedEdges.problems,
    ...parsedArms.problems,
  ];

  // what the merge adds and changes: a dry run answers it too, so the engineer sees it before confirming
  let counts = { added: { nodes: 0, edges: 0 }, updated: { nodes: 0, edges: 0 } };
  const written = writeStation(ctx, req, (tx, row) => {
    const current = loadDocument(tx, row);
    // the rows that read are merged even when others did not, so one answer names every problem
    const merged = mergeCsvIntoDocument(
      current,
      parsedNodes.rows,
      parsedEdges.rows,
      names,
      parsedArms.rows,
      parsedNodes.unread,
    );
    const problems = [...fileProblems, ...merged.problems];
    if (problems.length) throw problemsError('The CSV import has problems', problems);
    const checked = parseStationDocument(merged.doc);
    if (!checked.ok) throw problemsError('The merged station model is not valid', checked.problems);

    const existingNodes = new Set(current.nodes.map((n) => n.key));
    let ord = current.nodes.length;
    for (const { value } of parsedNodes.rows) {
      if (existingNodes.has(value.key)) {
        const { ord: _keep, ...changes } = nodeToRow(row.id, value, 0);
        tx.update(nodes)
          .set(changes)
          .where(and(eq(nodes.stationId, row.id), eq(nodes.key, value.key)))
          .run();
      } else
        tx.insert(nodes)
          .values(nodeToRow(row.id, value, ord++))
          .run();
    }
    // one read of the station's edges, then a map lookup per row: never a scan of them per row
    const edgeIds = new Map(
      tx
        .select({ id: edges.id, from: edges.fromKey, to: edges.toKey, kind: edges.kind })
        .from(edges)
        .where(eq(edges.stationId, row.id))
        .all()
        .map((e) => [edgePairKey(e), e.id]),
    );
    let edgeOrd = current.edges.length;
    for (const { value } of parsedEdges.rows) {
      const existing = edgeIds.get(edgePairKey(value));
      if (existing !== undefined) {
        const { ord: _keep, ...changes } = edgeToRow(row.id, value, 0);
        tx.update(edges).set(changes).where(eq(edges.id, existing)).run();
      } else
        tx.insert(edges)
          .values(edgeToRow(row.id, value, edgeOrd++))
          .run();
    }
    if (parsedArms.rows.length)
      tx.update(stations)
        .set({ armsJson: JSON.stringify(merged.doc.arms) })
        .where(eq(stations.id, row.id))
        .run();
    counts = { added: merged.added, updated: merged.updated };
    return {
      action: 'station.import-csv',
      target: [files.nodes?.name, files.edges?.name, files.arms?.name].filter(Boolean).join(', '),
      before: undefined,
      after: counts,
      summary: `imported CSV (${merged.added.nodes} nodes added, ${merged.updated.nodes} updated; ${merged.added.edges} edges added, ${merged.updated.edges} updated)`,
      result: counts,
      change: changeSince(tx, row.id, current),
    };
  });
  if (isDryRun(written)) return { ...written, ...counts };
  const station = getStation(ctx.db, req.stationId);
  return { station, counts: station.counts, added: written.added, updated: written.updated };
}
