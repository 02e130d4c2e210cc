import { z } from 'zod';

/**
 * The station document: the import and export format of a station's exterior model. Outside tools
 * read and write it as it is: fields may be added, none renamed, removed or given another meaning.
 * All lengths in metres, positions [x, y, z] in the station's body frame.
 */

export const NODE_KINDS = ['airlock', 'junction', 'anchor', 'socket', 'worksite'] as const;
export const EDGE_KINDS = ['handrail', 'hop', 'ride'] as const;
export const HAZARD_KINDS = ['keep-out', 'caution'] as const;
export const SEGMENT_KINDS = ['truss', 'module', 'platform'] as const;

export const NodeKindSchema = z.enum(NODE_KINDS);
export const EdgeKindSchema = z.enum(EDGE_KINDS);
export const HazardKindSchema = z.enum(HAZARD_KINDS);
export const SegmentKindSchema = z.enum(SEGMENT_KINDS);
export type NodeKind = z.infer<typeof NodeKindSchema>;
export type EdgeKind = z.infer<typeof EdgeKindSchema>;
export type HazardKind = z.infer<typeof HazardKindSchema>;
export type SegmentKind = z.infer<typeof SegmentKindSchema>;

/** A finite number: NaN and ±Infinity are refused everywhere a number is read. */
export const FiniteSchema = z
  .number({ error: (issue) => (typeof issue.input === 'number' ? 'must be a finite number' : undefined) })
  .refine(Number.isFinite, 'must be a finite number');
export const Vec3Schema = z.tuple([FiniteSchema, FiniteSchema, FiniteSchema]);
export type Vec3 = [number, number, number];

const KEY_MAX = 64;
const KEY_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.:-]*$/;
const KEY_PATTERN_MESSAGE = 'letters, digits, and _ . : - only, starting with a letter or digit';

/** Keys are short, human-typed identifiers such as `PB3-A07`. */
export const KeySchema = z
  .string()
  .min(1, 'must not be empty')
  .max(KEY_MAX, `must be at most ${KEY_MAX} characters`)
  .regex(KEY_PATTERN, KEY_PATTERN_MESSAGE);

/**
 * A list of up to `max` keys, each held to KeySchema's rules (same messages, by index) in one pass:
 * zod's per-element checks cost about ten times as much on a 20,000-key list, on the request thread.
 */
export function keyListSchema(max: number, what: string) {
  return z
    .array(z.string())
    .max(max, `at most ${max} ${what}`)
    .superRefine((keys, ctx) => {
      keys.forEach((key, i) => {
        const message =
          key.length === 0
            ? 'must not be empty'
            : key.length > KEY_MAX
              ? `must be at most ${KEY_MAX} characters`
              : KEY_PATTERN.test(key)
                ? null
                : KEY_PATTERN_MESSAGE;
        if (message) ctx.addIssue({ code: 'custom', path: [i], message });
      });
    });
}

const positive = (what: string) => FiniteSchema.refine((v) => v > 0, `${what} must be greater than 0`);
const nonNegative = (what: string) => FiniteSchema.refine((v) => v >= 0, `${what} must not be negative`);

export const OrbitSettingsSchema = z.object({
  altitudeKm: FiniteSchema.refine((v) => v >= 100 && v <= 40000, 'altitude must be between 100 and 40000 km'),
  betaDeg: FiniteSchema.refine((v) => v >= -90 && v <= 90, 'beta angle must be between -90 and 90 degrees'),
});
export type OrbitSettings = z.infer<typeof OrbitSettingsSchema>;

/**
 * Translation and reach settings. Every default here is a planning default from memory (the
 * suited work envelope's dimensions and translation speeds are not verified), except the tether
 * length, which is the commonly reported 85 ft safety tether (25.9 m).
 */
export const DEFAULT_SETTINGS = {
  tetherLengthM: 25.9,
  speedsMps: { handrail: 0.1, hop: 0.1, ride: 0.05 },
  hopSeconds: 30,
  swapSeconds: 90,
  /** getting into or out of a foot restraint, each */
  restraintSeconds: 120,
  carryFactor: 1.5,
  reach: { standOffM: 1.0, radiusM: 0.7, yawStepDeg: 15, pitchStepDeg: 15 },
} as const;

export const StationSettingsSchema = z.object({
  tetherLengthM: positive('tether length').default(DEFAULT_SETTINGS.tetherLengthM),
  speedsMps: z
    .object({
      handrail: positive('handrail speed').default(DEFAULT_SETTINGS.speedsMps.handrail),
      hop: positive('hop speed').default(DEFAULT_SETTINGS.speedsMps.hop),
      ride: positive('ride speed').default(DEFAULT_SETTINGS.speedsMps.ride),
    })
    .default({ ...DEFAULT_SETTINGS.speedsMps }),
  hopSeconds: nonNegative('hop overhead').default(DEFAULT_SETTINGS.hopSeconds),
  swapSeconds: nonNegative('swap time').default(DEFAULT_SETTINGS.swapSeconds),
  restraintSeconds: nonNegative('restraint get-in time').default(DEFAULT_SETTINGS.restraintSeconds),
  carryFactor: FiniteSchema.refine((v) => v >= 1, 'carry factor must be at least 1').default(
    DEFAULT_SETTINGS.carryFactor,
  ),
  reach: z
    .object({
      standOffM: nonNegative('stand-off').default(DEFAULT_SETTINGS.reach.standOffM),
      radiusM: positive('reach radius').default(DEFAULT_SETTINGS.reach.radiusM),
      yawStepDeg: positive('yaw step').default(DEFAULT_SETTINGS.reach.yawStepDeg),
      pitchStepDeg: positive('pitch step').default(DEFAULT_SETTINGS.reach.pitchStepDeg),
    })
    .default({ ...DEFAULT_SETTINGS.reach }),
});
export type StationSettings = z.infer<typeof StationSettingsSchema>;

/**
 * A segment side at the most, metres: a whole station's truss is about a hundred metres long, and the
 * socket planner's grid over a face grows with its area.
 */
export const MAX_SEGMENT_SIDE_M = 1000;
const segmentSide = positive('size').refine(
  (v) => v <= MAX_SEGMENT_SIDE_M,
  `size must be at most ${MAX_SEGMENT_SIDE_M} m on a side`,
);
export const SegmentSizeSchema = z.tuple([segmentSide, segmentSide, segmentSide]);

export const SegmentSchema = z.object({
  key: KeySchema,
  label: z.string().max(200).optional(),
  kind: SegmentKindSchema.default('truss'),
  center: Vec3Schema,
  size: SegmentSizeSchema,
  /** Euler angles in degrees, XYZ order. */
  rotationDeg: Vec3Schema.optional(),
});
export type Segment = z.infer<typeof SegmentSchema>;

export const NodeSchema = z
  .object({
    key: KeySchema,
    kind: NodeKindSchema,
    label: z.string().max(200).optional(),
    position: Vec3Schema,
    normal: Vec3Schema.optional(),
    notes: z.string().max(4000).optional(),
  })
  .superRefine((n, ctx) => {
    if (n.kind === 'socket' && !n.normal) {
      ctx.addIssue({ code: 'custom', path: ['normal'], message: 'a socket needs a unit normal' });
    }
    if (n.normal) {
      const len = Math.hypot(n.normal[0], n.normal[1], n.normal[2]);
      if (Math.abs(len - 1) > 1e-3) {
        ctx.addIssue({
          code: 'custom',
          path: ['normal'],
          message: `normal must be a unit vector (its length is ${len.toFixed(4)})`,
        });
      }
    }
  });
export type StationNode = z.infer<typeof NodeSchema>;

export const EdgeSchema = z.object({
  from: KeySchema,
  to: KeySchema,
  kind: EdgeKindSchema,
  lengthM: nonNegative('length').optional(),
  closed: z.boolean().optional(),
  label: z.string().max(200).optional(),
});
export type StationEdge = z.infer<typeof EdgeSchema>;

export const HazardSchema = z.discriminatedUnion('shape', [
  z.object({
    key: KeySchema,
    kind: HazardKindSchema,
    label: z.string().max(200).optional(),
    shape: z.literal('sphere'),
    center: Vec3Schema,
    radiusM: positive('radius'),
  }),
  z
    .object({
      key: KeySchema,
      kind: HazardKindSchema,
      label: z.string().max(200).optional(),
      shape: z.literal('box'),
      min: Vec3Schema,
      max: Vec3Schema,
    })
    .superRefine((h, ctx) => {
      for (let i = 0; i < 3; i++) {
        if (!(h.max[i] > h.min[i])) {
          ctx.addIssue({
            code: 'custom',
            path: ['max', i],
            message: 'box max must be greater than min on every axis',
          });
        }
      }
    }),
]);
export type Hazard = z.infer<typeof HazardSchema>;

/**
 * Planning defaults for a robotic arm carrying a crew member in a foot restraint on its end, from
 * memory (the station's main arm is about 17.6 m long, from space agency public material; its tip speed with a person on it
 * and its settle time are not published figures).
 */
export const DEFAULT_ARM = { reachM: 17.6, minReachM: 1, tipSpeedMps: 0.05, settleSeconds: 60 } as const;
export const MAX_ARMS = 20;

/**
 * A robotic arm that positions a crew member: fixed at `baseNode`, its tip reaches the shell
 * `minReachM ≤ |p − base| ≤ reachM` and moves in straight lines at `tipSpeedMps`, then settles.
 */
export const ArmSchema = z
  .object({
    key: KeySchema,
    label: z.string().max(200).optional(),
    baseNode: KeySchema,
    reachM: positive('reach'),
    minReachM: nonNegative('minimum reach').optional(),
    tipSpeedMps: positive('tip speed'),
    settleSeconds: nonNegative('settle time'),
  })
  .superRefine((a, ctx) => {
    if (a.minReachM !== undefined && !(a.minReachM < a.reachM)) {
      ctx.addIssue({
        code: 'custom',
        path: ['minReachM'],
        message: `minimum reach must be below the reach (${a.reachM} m)`,
      });
    }
  });
export type Arm = z.infer<typeof ArmSchema>;

/** How many items of each collection a station may hold. */
export const STATION_LIMITS = { segments: 20000, nodes: 200000, edges: 400000, hazards: 1000 } as const;

export const StationDocumentSchema = z.object({
  format: z.literal('tetherwise.station'),
  version: z.literal(1),
  name: z.string().trim().min(1, 'a station needs a name').max(200),
  orbit: OrbitSettingsSchema.default({ altitudeKm: 410, betaDeg: 20 }),
  settings: StationSettingsSchema.default(StationSettingsSchema.parse({})),
  segments: z.array(SegmentSchema).max(STATION_LIMITS.segments).default([]),
  nodes: z.array(NodeSchema).max(STATION_LIMITS.nodes),
  edges: z.array(EdgeSchema).max(STATION_LIMITS.edges),
  hazards: z.array(HazardSchema).max(STATION_LIMITS.hazards).default([]),
  arms: z.array(ArmSchema).max(MAX_ARMS, `at most ${MAX_ARMS} arms`).default([]),
});
export type StationDocument = z.infer<typeof StationDocumentSchema>;
export type StationDocumentInput = z.input<typeof StationDocumentSchema>;

/** A problem found in a station document, by JSON path (`nodes[3].position[1]`) or CSV line. */
export interface DocumentProblem {
  path: string;
  message: string;
}

/** One edge per kind between two nodes, either way round: the key duplicates are found and merged by. */
export const edgePairKey = (e: Pick<StationEdge, 'from' | 'to' | 'kind'>) =>
  [e.from, e.to].sort().join('\u0000') + '\u0000' + e.kind;

/** What the graph rules read of a document: keys and edge ends (a key that is not text is skipped). */
export interface GraphRulesInput {
  nodes: readonly { key?: unknown }[];
  segments: readonly { key?: unknown }[];
  hazards: readonly { key?: unknown }[];
  edges: readonly { from?: unknown; to?: unknown; kind?: unknown }[];
  arms: readonly { key?: unknown; baseNode?: unknown }[];
}

/**
 * Graph rules the schema cannot express: unique keys (nodes, segments and hazards each), edges that
 * name known nodes, no self-loops, no duplicate edges between the same pair of the same kind.
 */
export function checkStationGraphRules(doc: GraphRulesInput): DocumentProblem[] {
  const problems: DocumentProblem[] = [];
  const seen = new Map<string, number>();
  doc.nodes.forEach((n, i) => {
    if (typeof n.key !== 'string') return;
    const first = seen.get(n.key);
    if (first !== undefined) {
      problems.push({
        path: `nodes[${i}].key`,
        message: `duplicate node key "${n.key}" (first at nodes[${first}])`,
      });
    } else seen.set(n.key, i);
  });
  const segKeys = new Map<string, number>();
  doc.segments.forEach((s, i) => {
    if (typeof s.key !== 'string') return;
    const first = segKeys.get(s.key);
    if (first !== undefined) {
      problems.push({
        path: `segments[${i}].key`,
        message: `duplicate segment key "${s.key}" (first at segments[${first}])`,
      });
    } else segKeys.set(s.key, i);
  });
  const hazKeys = new Map<string, number>();
  doc.hazards.forEach((h, i) => {
    if (typeof h.key !== 'string') return;
    const first = hazKeys.get(h.key);
    if (first !== undefined) {
      problems.push({
        path: `hazards[${i}].key`,
        message: `duplicate hazard key "${h.key}" (first at hazards[${first}])`,
      });
    } else hazKeys.set(h.key, i);
  });
  const textKeys = (a: { key?: unknown; baseNode?: unknown }) =>
    typeof a.key === 'string' && typeof a.baseNode === 'string';
  problems.push(
    ...armProblems(
      doc.arms.filter(textKeys) as Pick<Arm, 'key' | 'baseNode'>[],
      (key) => seen.has(key),
      'arms',
      doc.arms.map((a, i) => (textKeys(a) ? i : -1)).filter((i) => i >= 0),
    ),
  );
  const pairs = new Map<string, number>();
  doc.edges.forEach((e, i) => {
    if (typeof e.from !== 'string' || typeof e.to !== 'string' || typeof e.kind !== 'string') return;
    if (!seen.has(e.from))
      problems.push({ path: `edges[${i}].from`, message: `unknown node key "${e.from}"` });
    if (!seen.has(e.to)) problems.push({ path: `edges[${i}].to`, message: `unknown node key "${e.to}"` });
    if (e.from === e.to)
      problems.push({ path: `edges[${i}]`, message: `an edge cannot join "${e.from}" to itself` });
    const pair = edgePairKey(e as Pick<StationEdge, 'from' | 'to' | 'kind'>);
    const first = pairs.get(pair);
    if (first !== undefined) {
      problems.push({
        path: `edges[${i}]`,
        message: `duplicate ${e.kind} edge between "${e.from}" and "${e.to}" (first at edges[${first}])`,
      });
    } else pairs.set(pair, i);
  });
  return problems;
}

/**
 * An arm's rules against the station: keys unique among arms and apart from node keys (a foot
 * restraint installed "at" an arm's key is on its end), and a base that is a node of the station.
 */
export function armProblems(
  arms: readonly Pick<Arm, 'key' | 'baseNode'>[],
  isNode: (key: string) => boolean,
  prefix = 'arms',
  /** each arm's index in the list the paths name, when `arms` is a part of it */
  indices?: readonly number[],
): DocumentProblem[] {
  const problems: DocumentProblem[] = [];
  const first = new Map<string, number>();
  arms.forEach((a, k) => {
    const i = indices?.[k] ?? k;
    const at = first.get(a.key);
    if (at !== undefined)
      problems.push({
        path: `${prefix}[${i}].key`,
        message: `duplicate arm key "${a.key}" (first at arms[${at}])`,
      });
    else first.set(a.key, i);
    if (isNode(a.key))
      problems.push({
        path: `${prefix}[${i}].key`,
        message: `"${a.key}" is already a node key; an arm needs a key of its own`,
      });
    if (!isNode(a.baseNode))
      problems.push({ path: `${prefix}[${i}].baseNode`, message: `unknown node key "${a.baseNode}"` });
  });
  return problems;
}

/** Renders a zod issue path as a JSON path: ['nodes', 3, 'position', 1] → `nodes[3].position[1]`. */
export function formatIssuePath(path: ReadonlyArray<PropertyKey>): string {
  let out = '';
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`;
    else out += out ? `.${String(p)}` : String(p);
  }
  return out || '(document)';
}

/** The lists of a document that failed its schema, as far as they can be read (anything else: empty). */
function looseGraphOf(input: unknown): GraphRulesInput {
  const doc = (typeof input === 'object' && input !== null ? input : {}) as Record<string, unknown>;
  const list = (name: string) =>
    (Array.isArray(doc[name]) ? doc[name] : []).map((v: unknown) =>
      typeof v === 'object' && v !== null ? (v as Record<string, unknown>) : {},
    );
  return {
    nodes: list('nodes'),
    segments: list('segments'),
    hazards: list('hazards'),
    edges: list('edges'),
    arms: list('arms'),
  };
}

/** Parses and checks a station document; returns the document or every problem found. */
export function parseStationDocument(
  input: unknown,
): { ok: true; doc: StationDocument } | { ok: false; problems: DocumentProblem[] } {
  const parsed = StationDocumentSchema.safeParse(input);
  if (!parsed.success) {
    // the graph rules too, on what can be read, so one answer names every problem of the document
    const problems = parsed.error.issues.map((i) => ({ path: formatIssuePath(i.path), message: i.message }));
    return { ok: false, problems: [...problems, ...checkStationGraphRules(looseGraphOf(input))] };
  }
  const problems = checkStationGraphRules(parsed.data);
  return problems.length ? { ok: false, problems } : { ok: true, doc: parsed.data };
}
