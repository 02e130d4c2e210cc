import Papa from 'papaparse';
import {
  ArmSchema,
  edgePairKey,
  EdgeSchema,
  NodeSchema,
  type Arm,
  type DocumentProblem,
  type StationDocument,
  type StationEdge,
  type StationNode,
} from './station';

/**
 * CSV tables of nodes, edges and arms, merged into an existing station: nodes and arms are upserted
 * by key, edges by their two ends and kind (either direction). Every problem names the file, line and column,
 * e.g. `nodes.csv line 7, column x: must be a finite number`. The header is line 1.
 */
export const NODE_COLUMNS = ['key', 'kind', 'label', 'x', 'y', 'z', 'nx', 'ny', 'nz', 'notes'] as const;
export const EDGE_COLUMNS = ['from', 'to', 'kind', 'lengthM', 'closed'] as const;
export const ARM_COLUMNS = [
  'key',
  'label',
  'baseNode',
  'reachM',
  'minReachM',
  'tipSpeedMps',
  'settleSeconds',
] as const;
const REQUIRED = {
  nodes: ['key', 'kind', 'x', 'y', 'z'],
  edges: ['from', 'to', 'kind'],
  arms: ['key', 'baseNode', 'reachM', 'tipSpeedMps', 'settleSeconds'],
} as const;

export interface CsvRow<T> {
  line: number;
  value: T;
}

interface Table {
  header: string[];
  rows: { line: number; cells: Record<string, string> }[];
}

const where = (file: string, line: number, column?: string) =>
  `${file} line ${line}${column ? `, column ${column}` : ''}`;

function readTable(
  text: string,
  file: string,
  columns: readonly string[],
  required: readonly string[],
  problems: DocumentProblem[],
): Table | null {
  const result = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false, delimiter: ',' });
  const data = result.data;
  const rowLines = rowStartLines(text);
  for (const e of result.errors)
    problems.push({ path: where(file, rowLines[e.row ?? 0] ?? 1), message: e.message });
  if (!data.length || data[0].every((c) => c.trim() === '')) {
    problems.push({
      path: where(file, 1),
      message: `the header row is missing (expected ${columns.join(',')})`,
    });
    return null;
  }
  const header = data[0].map((h) => h.trim());
  header.forEach((h, i) => {
    if (!columns.includes(h))
      problems.push({
        path: where(file, 1, h || `#${i + 1}`),
        message: `unknown column (expected ${columns.join(', ')})`,
      });
    else if (header.indexOf(h) !== i)
      problems.push({ path: where(file, 1, h), message: 'column appears twice' });
  });
  const missing = required.filter((r) => !header.includes(r));
  for (const r of missing) problems.push({ path: where(file, 1, r), message: 'required column is missing' });
  if (missing.length) return null;

  const rows: Table['rows'] = [];
  for (let i = 1; i < data.length; i++) {
    const cells = data[i];
    const rowLine = rowLines[i] ?? rowLines[rowLines.length - 1] + 1;
    if (cells.every((c) => c.trim() === '')) continue;
    if (cells.length > header.length) {
      problems.push({
        path: where(file, rowLine),
        message: `has ${cells.length} cells but the header has ${header.length}`,
      });
      continue;
    }
    const record: Record<string, string> = {};
    header.forEach((h, j) => (record[h] = (cells[j] ?? '').trim()));
    rows.push({ line: rowLine, cells: record });
  }
  return { header, rows };
}

/** The line each CSV row starts on, counted from the text so a quoted field spanning lines does not shift later reports. */
function rowStartLines(text: string): number[] {
  const lines: number[] = [];
  let offset = 0;
  let line = 1;
  while (offset < text.length) {
    lines.push(line);
    const next = nextRowOffset(text, offset);
    for (let i = offset; i < next; i++) if (text[i] === '\n') line++;
    offset = next;
  }
  return lines;
}

/** Offset just after the row that starts at `offset`, honouring quoted fields with line breaks. */
function nextRowOffset(text: string, offset: number): number {
  let quoted = false;
  for (let i = offset; i < text.length; i++) {
    const c = text[i];
    if (c === '"') quoted = !quoted;
    else if (c === '\n' && !quoted) return i + 1;
  }
  return text.length;
}

function number(
  cells: Record<string, string>,
  column: string,
  file: string,
  line: number,
  problems: DocumentProblem[],
): number | undefined {
  const raw = cells[column] ?? '';
  if (raw === '') return undefined;
  const v = Number(raw);
  if (!Number.isFinite(v)) {
    problems.push({ path: where(file, line, column), message: 'must be a finite number' });
    return undefined;
  }
  return v;
}

/** Which CSV column a document field's zod path points at. */
function nodeColumn(path: ReadonlyArray<PropertyKey>): string {
  const [field, index] = path;
  if (field === 'position') return ['x', 'y', 'z'][Number(index)] ?? 'x';
  if (field === 'normal') return ['nx', 'ny', 'nz'][Number(index)] ?? 'nx';
  return String(field ?? 'key');
}

/**
 * The node rows read, the problems found, and `unread`: the keys of the rows that could not be read
 * (their problems are listed), which edges and arms may name without being told the key is unknown.
 */
export function parseNodesCsv(
  text: string,
  file = 'nodes.csv',
): { rows: CsvRow<StationNode>[]; problems: DocumentProblem[]; unread: string[] } {
  const problems: DocumentProblem[] = [];
  const table = readTable(text, file, NODE_COLUMNS, REQUIRED.nodes, problems);
  const rows: CsvRow<StationNode>[] = [];
  const unread: string[] = [];
  if (!table) return { rows, problems, unread };
  for (const { line, cells } of table.rows) {
    const before = problems.length;
    const failed = () => {
      if (cells.key?.trim()) unread.push(cells.key.trim());
    };
    const n = (c: string) => number(cells, c, file, line, problems);
    const [x, y, z, nx, ny, nz] = ['x', 'y', 'z', 'nx', 'ny', 'nz'].map(n);
    for (const c of ['x', 'y', 'z'] as const)
      if (cells[c] === '') problems.push({ path: where(file, line, c), message: 'required' });
    const normalCells = [nx, ny, nz].filter((v) => v !== undefined).length;
    if (normalCells > 0 && normalCells < 3)
      problems.push({ path: where(file, line, 'nx'), message: 'a normal needs all of nx, ny and nz' });
    if (problems.length > before) {
      failed();
      continue;
    }
    const candidate = {
      key: cells.key,
      kind: cells.kind,
      ...(cells.label ? { label: cells.label } : {}),
      position: [x, y, z],
      ...(normalCells === 3 ? { normal: [nx, ny, nz] } : {}),
      ...(cells.notes ? { notes: cells.notes } : {}),
    };
    const parsed = NodeSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        problems.push({ path: where(file, line, nodeColumn(issue.path)), message: issue.message });
      failed();
      continue;
    }
    rows.push({ line, value: parsed.data });
  }
  return { rows, problems, unread };
}

const BOOLEAN: Record<string, boolean> = {
  '': false,
  true: true,
  false: false,
  yes: true,
  no: false,
  '1': true,
  '0': false,
};

export function parseEdgesCsv(
  text: string,
  file = 'edges.csv',
): { rows: CsvRow<StationEdge>[]; problems: DocumentProblem[] } {
  const problems: DocumentProblem[] = [];
  const table = readTable(text, file, EDGE_COLUMNS, REQUIRED.edges, problems);
  const rows: CsvRow<StationEdge>[] = [];
  if (!table) return { rows, problems };
  for (const { line, cells } of table.rows) {
    const before = problems.length;
    const lengthM = number(cells, 'lengthM', file, line, problems);
    const closed = BOOLEAN[(cells.closed ?? '').toLowerCase()];
    if (closed === undefined)
      problems.push({
        path: where(file, line, 'closed'),
        message: 'must be true or false (or yes/no, 1/0, or empty)',
      });
    if (problems.length > before) continue;
    const candidate = {
      from: cells.from,
      to: cells.to,
      kind: cells.kind,
      ...(lengthM !== undefined ? { lengthM } : {}),
      ...(closed ? { closed } : {}),
    };
    const parsed = EdgeSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        problems.push({ path: where(file, line, String(issue.path[0] ?? 'from')), message: issue.message });
      continue;
    }
    rows.push({ line, value: parsed.data });
  }
  return { rows, problems };
}

/** Arms by key, one a row; the base node is checked against the merged model. */
export function parseArmsCsv(
  text: string,
  file = 'arms.csv',
): { rows: CsvRow<Arm>[]; problems: DocumentProblem[] } {
  const problems: DocumentProblem[] = [];
  const table = readTable(text, file, ARM_COLUMNS, REQUIRED.arms, problems);
  const rows: CsvRow<Arm>[] = [];
  if (!table) return { rows, problems };
  for (const { line, cells } of table.rows) {
    const before = problems.length;
    const n = (c: string) => number(cells, c, file, line, problems);
    const [reachM, minReachM, tipSpeedMps, settleSeconds] = [
      'reachM',
      'minReachM',
      'tipSpeedMps',
      'settleSeconds',
    ].map(n);
    for (const c of REQUIRED.arms)
      if (cells[c] === '') problems.push({ path: where(file, line, c), message: 'required' });
    if (problems.length > before) continue;
    const candidate = {
      key: cells.key,
      ...(cells.label ? { label: cells.label } : {}),
      baseNode: cells.baseNode,
      reachM,
      ...(minReachM !== undefined ? { minReachM } : {}),
      tipSpeedMps,
      settleSeconds,
    };
    const parsed = ArmSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        problems.push({ path: where(file, line, String(issue.path[0] ?? 'key')), message: issue.message });
      continue;
    }
    rows.push({ line, value: parsed.data });
  }
  return { rows, problems };
}

/** An arms table for export: the same columns the import reads. */
export function armsToCsv(arms: readonly Arm[]): string {
  return Papa.unparse({
    fields: [...ARM_COLUMNS],
    data: arms.map((a) => ARM_COLUMNS.map((c) => (a[c] === undefined ? '' : String(a[c])))),
  });
}

/**
 * Merges parsed CSV rows into a document: a node row replaces the node with its key (or is added),
 * an edge row replaces the edge of the same kind between the same two nodes (or is added). Also
 * checks, by line, that every edge names a node of the merged model and that a file does not name
 * the same key or edge twice.
 */
export function mergeCsvIntoDocument(
  doc: StationDocument,
  nodeRows: CsvRow<StationNode>[],
  edgeRows: CsvRow<StationEdge>[],
  files: { nodes: string; edges: string; arms?: string } = { nodes: 'nodes.csv', edges: 'edges.csv' },
  armRows: CsvRow<Arm>[] = [],
  /** keys of node rows that could not be read (already reported): an edge or arm naming one is skipped, not reported */
  unread: readonly string[] = [],
): {
  doc: StationDocument;
  problems: DocumentProblem[];
  added: { nodes: number; edges: number };
  updated: { nodes: number; edges: number };
} {
  const problems: DocumentProblem[] = [];
  const nodesOut = [...doc.nodes];
  const nodeIndex = new Map(nodesOut.map((n, i) => [n.key, i]));
  const csvKeys = new Map<string, number>();
  const added = { nodes: 0, edges: 0 };
  const updated = { nodes: 0, edges: 0 };
  for (const { line, value } of nodeRows) {
    const first = csvKeys.get(value.key);
    if (first !== undefined) {
      problems.push({
        path: where(files.nodes, line, 'key'),
        message: `key "${value.key}" already appears on line ${first}`,
      });
      continue;
    }
    csvKeys.set(value.key, line);
    const at = nodeIndex.get(value.key);
    if (at === undefined) {
      nodeIndex.set(value.key, nodesOut.length);
      nodesOut.push(value);
      added.nodes++;
    } else {
      nodesOut[at] = value;
      updated.nodes++;
    }
  }
  const unreadKeys = new Set(unread);
  const edgesOut = [...doc.edges];
  const edgeIndex = new Map(edgesOut.map((e, i) => [edgePairKey(e), i]));
  const csvPairs = new Map<string, number>();
  for (const { line, value } of edgeRows) {
    let bad = false;
    for (const end of ['from', 'to'] as const) {
      if (unreadKeys.has(value[end]) && !nodeIndex.has(value[end])) bad = true;
      else if (!nodeIndex.has(value[end])) {
        problems.push({ path: where(files.edges, line, end), message: `unknown node key "${value[end]}"` });
        bad = true;
      }
    }
    if (value.from === value.to) {
      problems.push({
        path: where(files.edges, line, 'to'),
        message: `an edge cannot join "${value.from}" to itself`,
      });
      bad = true;
    }
    const pair = edgePairKey(value);
    const first = csvPairs.get(pair);
    if (first !== undefined) {
      problems.push({
        path: where(files.edges, line),
        message: `the same ${value.kind} edge already appears on line ${first}`,
      });
      bad = true;
    }
    if (bad) continue;
    csvPairs.set(pair, line);
    const at = edgeIndex.get(pair);
    if (at === undefined) {
      edgeIndex.set(pair, edgesOut.length);
      edgesOut.push(value);
      added.edges++;
    } else {
      edgesOut[at] = value;
      updated.edges++;
    }
  }
  const armsOut = [...doc.arms];
  const armFile = files.arms ?? 'arms.csv';
  const csvArms = new Map<string, number>();
  for (const { line, value } of armRows) {
    const first = csvArms.get(value.key);
    if (first !== undefined) {
      problems.push({
        path: where(armFile, line, 'key'),
        message: `arm "${value.key}" already appears on line ${first}`,
      });
      continue;
    }
    csvArms.set(value.key, line);
    if (unreadKeys.has(value.baseNode) && !nodeIndex.has(value.baseNode)) continue;
    if (!nodeIndex.has(value.baseNode)) {
      problems.push({
        path: where(armFile, line, 'baseNode'),
        message: `unknown node key "${value.baseNode}"`,
      });
      continue;
    }
    const at = armsOut.findIndex((a) => a.key === value.key);
    if (at < 0) armsOut.push(value);
    else armsOut[at] = value;
  }
  return { doc: { ...doc, nodes: nodesOut, edges: edgesOut, arms: armsOut }, problems, added, updated };
}
