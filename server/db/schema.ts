import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { MANIFEST_KINDS } from '../../shared/schemas/plan';

const timestamps = {
  createdAt: text('created_at')
    .notNull()
    .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`),
  updatedAt: text('updated_at')
    .notNull()
    .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`),
};

// ── People ──────────────────────────────────────────────────────────────────────────────────────

export const users = sqliteTable('users', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: text('role', { enum: ['admin', 'planner', 'engineer', 'trainer', 'viewer'] }).notNull(),
  /** null until the person sets a password from their invitation */
  passwordHash: text('password_hash'),
  disabled: integer('disabled', { mode: 'boolean' }).notNull().default(false),
  /** bumped to end every session of this user (sign-out everywhere, disable, password change) */
  tokenVersion: integer('token_version').notNull().default(0),
  ...timestamps,
});

/** Single-use, expiring tokens for setting a password (invitation or reset). Only the hash is kept. */
export const passwordTokens = sqliteTable(
  'password_tokens',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenHash: text('token_hash').notNull().unique(),
    purpose: text('purpose', { enum: ['invite', 'reset'] }).notNull(),
    expiresAt: text('expires_at').notNull(),
    usedAt: text('used_at'),
    createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('password_tokens_user_idx').on(t.userId)],
);

/**
 * Sessions ended by signing out before their token expired: the token's SHA-256 and when it would
 * have expired (the row is dropped after that). A token listed here is no longer accepted.
 */
export const revokedSessions = sqliteTable(
  'revoked_sessions',
  {
    tokenHash: text('token_hash').primaryKey(),
    expiresAt: text('expires_at').notNull(),
  },
  (t) => [index('revoked_sessions_expires_idx').on(t.expiresAt)],
);

// ── Station model ───────────────────────────────────────────────────────────────────────────────

export const stations = sqliteTable('stations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull(),
  version: integer('version').notNull().default(1),
  altitudeKm: real('altitude_km').notNull(),
  betaDeg: real('beta_deg').notNull(),
  /** the station document's `settings` object, JSON (tether, speeds, overheads, reach) */
  settingsJson: text('settings_json').notNull(),
  /** the station document's `arms` list, JSON (robotic arms that position a crew member) */
  armsJson: text('arms_json').notNull().default('[]'),
  createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
  updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
});

export const segments = sqliteTable(
  'segments',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    label: text('label'),
    kind: text('kind', { enum: ['truss', 'module', 'platform'] }).notNull(),
    cx: real('cx').notNull(),
    cy: real('cy').notNull(),
    cz: real('cz').notNull(),
    sx: real('sx').notNull(),
    sy: real('sy').notNull(),
    sz: real('sz').notNull(),
    rx: real('rx').notNull().default(0),
    ry: real('ry').notNull().default(0),
    rz: real('rz').notNull().default(0),
    hasRotation: integer('has_rotation', { mode: 'boolean' }).notNull().default(false),
    ord: integer('ord').notNull(),
  },
  (t) => [uniqueIndex('segments_station_key').on(t.stationId, t.key)],
);

export const nodes = sqliteTable(
  'nodes',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    kind: text('kind', { enum: ['airlock', 'junction', 'anchor', 'socket', 'worksite'] }).notNull(),
    label: text('label'),
    x: real('x').notNull(),
    y: real('y').notNull(),
    z: real('z').notNull(),
    nx: real('nx'),
    ny: real('ny'),
    nz: real('nz'),
    notes: text('notes'),
    ord: integer('ord').notNull(),
  },
  (t) => [uniqueIndex('nodes_station_key').on(t.stationId, t.key)],
);

export const edges = sqliteTable(
  'edges',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    fromKey: text('from_key').notNull(),
    toKey: text('to_key').notNull(),
    kind: text('kind', { enum: ['handrail', 'hop', 'ride'] }).notNull(),
    /** null: derived from the node positions */
    lengthM: real('length_m'),
    closed: integer('closed', { mode: 'boolean' }).notNull().default(false),
    label: text('label'),
    ord: integer('ord').notNull(),
  },
  // the station's edges in order (and the next order number), and by either end: the twin check on
  // an edge edit and a node's edges on its removal
  (t) => [
    index('edges_station_ord_idx').on(t.stationId, t.ord),
    index('edges_station_from_idx').on(t.stationId, t.fromKey),
    index('edges_station_to_idx').on(t.stationId, t.toKey),
  ],
);

export const hazards = sqliteTable(
  'hazards',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    kind: text('kind', { enum: ['keep-out', 'caution'] }).notNull(),
    label: text('label'),
    /** the hazard as in the station document (shape, centre/radius or min/max), JSON */
    shapeJson: text('shape_json').notNull(),
    ord: integer('ord').notNull(),
  },
  (t) => [uniqueIndex('hazards_station_key').on(t.stationId, t.key)],
);

/** Who changed what in a station model, with the state before and after (JSON). */
export const stationAudit = sqliteTable(
  'station_audit',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action').notNull(),
    target: text('target'),
    beforeJson: text('before_json'),
    afterJson: text('after_json'),
    versionAfter: integer('version_after').notNull(),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('station_audit_station_idx').on(t.stationId)],
);

/**
 * Every kept version of a station model: what the write that made it changed (a StationChange, JSON;
 * the first kept version's change starts from an empty station), and now and then the whole
 * document, so a version is read back without replaying from the first. Rows are never updated.
 */
export const stationVersions = sqliteTable(
  'station_versions',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    action: text('action').notNull(),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    changeJson: text('change_json').notNull(),
    /** the change in a few words per kind (`summarizeStationChange`), JSON */
    summaryJson: text('summary_json').notNull().default('[]'),
    /** the whole station document at this version, on some versions only */
    snapshotJson: text('snapshot_json'),
    createdAt: timestamps.createdAt,
  },
  (t) => [uniqueIndex('station_versions_station_version').on(t.stationId, t.version)],
);

// ── Annotations ─────────────────────────────────────────────────────────────────────────────────

export const annotations = sqliteTable(
  'annotations',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    /** pinned to a node (by key) or to a free 3D point */
    nodeKey: text('node_key'),
    x: real('x').notNull(),
    y: real('y').notNull(),
    z: real('z').notNull(),
    title: text('title').notNull(),
    body: text('body').notNull(),
    status: text('status', { enum: ['open', 'resolved'] })
      .notNull()
      .default('open'),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    resolvedBy: integer('resolved_by').references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index('annotations_station_idx').on(t.stationId)],
);

export const annotationReplies = sqliteTable(
  'annotation_replies',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    annotationId: integer('annotation_id')
      .notNull()
      .references(() => annotations.id, { onDelete: 'cascade' }),
    body: text('body').notNull(),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('annotation_replies_annotation_idx').on(t.annotationId)],
);

/** Image attachments stored on disk under DATA_DIR with a random name. */
export const attachments = sqliteTable(
  'attachments',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    annotationId: integer('annotation_id')
      .notNull()
      .references(() => annotations.id, { onDelete: 'cascade' }),
    storedName: text('stored_name').notNull().unique(),
    originalName: text('original_name').notNull(),
    mimeType: text('mime_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    uploadedBy: integer('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('attachments_annotation_idx').on(t.annotationId)],
);

// ── Plans ───────────────────────────────────────────────────────────────────────────────────────

export const plans = sqliteTable(
  'plans',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'restrict' }),
    title: text('title').notNull(),
    date: text('date').notNull(),
    status: text('status', { enum: ['draft', 'in-review', 'approved'] })
      .notNull()
      .default('draft'),
    version: integer('version').notNull().default(1),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    approverId: integer('approver_id').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: text('approved_at'),
    submittedAt: text('submitted_at'),
    /** the station version the plan was submitted against, and approved against */
    submittedStationVersion: integer('submitted_station_version'),
    approvedStationVersion: integer('approved_station_version'),
    /** route mode, arm-ride allowance, orbit phase, limits and blocks: the plan's settings, JSON */
    settingsJson: text('settings_json').notNull(),
    ...timestamps,
  },
  (t) => [index('plans_station_idx').on(t.stationId)],
);

export const crewSlots = sqliteTable(
  'crew_slots',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    slot: text('slot', { enum: ['EV1', 'EV2'] }).notNull(),
    name: text('name').notNull(),
    tetherLengthM: real('tether_length_m').notNull(),
  },
  (t) => [uniqueIndex('crew_slots_plan_slot').on(t.planId, t.slot)],
);

export const tasks = sqliteTable(
  'tasks',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    ord: integer('ord').notNull(),
    title: text('title').notNull(),
    worksiteKey: text('worksite_key').notNull(),
    crew: text('crew', { enum: ['EV1', 'EV2', 'both'] }).notNull(),
    durationSeconds: integer('duration_seconds').notNull(),
    eclipseOnly: integer('eclipse_only', { mode: 'boolean' }).notNull().default(false),
    carrying: integer('carrying', { mode: 'boolean' }).notNull().default(false),
    socketKey: text('socket_key'),
    /** a task for both: `{ "EV1"?: key, "EV2"?: key }`, JSON */
    socketsJson: text('sockets_json'),
    toolsJson: text('tools_json').notNull().default('[]'),
    /** item actions `[{ do, item, by?, at? }]`, JSON */
    actionsJson: text('actions_json').notNull().default('[]'),
    /** done from an arm's foot restraint: `{ key, ingress, egress?, rider? }`, JSON */
    armJson: text('arm_json'),
    /** ids of the tasks of the same plan that must end before this one starts its work, JSON */
    afterJson: text('after_json').notNull().default('[]'),
    /** get-ahead work that may be dropped */
    optional: integer('optional', { mode: 'boolean' }).notNull().default(false),
    notes: text('notes'),
  },
  (t) => [index('tasks_plan_idx').on(t.planId)],
);

export const manifestItems = sqliteTable(
  'manifest_items',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    ord: integer('ord').notNull(),
    /** plan-unique */
    key: text('key').notNull(),
    name: text('name').notNull(),
    kind: text('kind', { enum: MANIFEST_KINDS }).notNull(),
    quantity: integer('quantity').notNull().default(1),
    carriedBy: text('carried_by', { enum: ['EV1', 'EV2'] }),
    startsAt: text('starts_at').notNull(),
    installedAt: text('installed_at'),
    leaveOutside: integer('leave_outside', { mode: 'boolean' }).notNull().default(false),
    notes: text('notes'),
  },
  (t) => [
    index('manifest_items_plan_idx').on(t.planId),
    uniqueIndex('manifest_items_plan_key').on(t.planId, t.key),
  ],
);

export const reviewComments = sqliteTable(
  'review_comments',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action', { enum: ['submit', 'approve', 'return', 'comment'] }).notNull(),
    body: text('body').notNull().default(''),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('review_comments_plan_idx').on(t.planId)],
);

export const planAudit = sqliteTable(
  'plan_audit',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action').notNull(),
    beforeJson: text('before_json'),
    afterJson: text('after_json'),
    versionAfter: integer('version_after').notNull(),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('plan_audit_plan_idx').on(t.planId)],
);

/**
 * A station write that touched a plan in review or approved: listed on the plan, with the changes
 * that touch its tasks, routes and sockets (JSON).
 */
export const planStationNotices = sqliteTable(
  'plan_station_notices',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    /** the station version the write made */
    stationVersion: integer('station_version').notNull(),
    planStatus: text('plan_status', { enum: ['draft', 'in-review', 'approved'] }).notNull(),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    summary: text('summary').notNull(),
    touchesJson: text('touches_json').notNull(),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('plan_station_notices_plan_idx').on(t.planId)],
);

/** EVAs planned as a series: each starts with the items where the one before left them. */
export const series = sqliteTable('series', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  title: text('title').notNull(),
  version: integer('version').notNull().default(1),
  authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
});

/** The EVAs of a series in order; a plan belongs to one series at most. */
export const seriesPlans = sqliteTable(
  'series_plans',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    seriesId: integer('series_id')
      .notNull()
      .references(() => series.id, { onDelete: 'cascade' }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    ord: integer('ord').notNull(),
  },
  (t) => [uniqueIndex('series_plans_plan').on(t.planId), index('series_plans_series_idx').on(t.seriesId)],
);

// ── Training ────────────────────────────────────────────────────────────────────────────────────

export const walkthroughs = sqliteTable(
  'walkthroughs',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    name: text('name').notNull(),
    stationId: integer('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    /** follows a plan (planId) or a single route (routeJson: from, to, mode, tether, carrying, ride) */
    planId: integer('plan_id').references(() => plans.id, { onDelete: 'cascade' }),
    routeJson: text('route_json'),
    /** the plan or station version the notes were written against, to flag later changes */
    basedOnVersion: integer('based_on_version').notNull(),
    /** trainer notes per step: { [stepId]: text } */
    notesJson: text('notes_json').notNull().default('{}'),
    version: integer('version').notNull().default(1),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index('walkthroughs_station_idx').on(t.stationId)],
);

/** Recent activity for the Home screen: one row per meaningful event. */
export const activity = sqliteTable(
  'activity',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    kind: text('kind').notNull(),
    summary: text('summary').notNull(),
    link: text('link'),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('activity_created_idx').on(t.createdAt)],
);

/** What the in-process development mail service received (only used when SMTP_URL is unset). */
export const mailboxMessages = sqliteTable('mailbox_messages', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  to: text('to').notNull(),
  from: text('from').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  receivedAt: text('received_at').notNull(),
});

// ── Runs: an approved plan as it is flown ───────────────────────────────────────────────────────

/** A run keeps the plan as it was opened on (JSON), so a later edit of the plan never changes it. */
export const runs = sqliteTable(
  'runs',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    planId: integer('plan_id')
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    planVersion: integer('plan_version').notNull(),
    planJson: text('plan_json').notNull(),
    /** EVA elapsed time 0, ISO */
    startedAt: text('started_at').notNull(),
    openedBy: integer('opened_by').references(() => users.id, { onDelete: 'set null' }),
    /** bumped by every event appended */
    version: integer('version').notNull().default(1),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('runs_plan_idx').on(t.planId)],
);

/** What happened during a run: append-only, each row naming who logged it and when. */
export const runEvents = sqliteTable(
  'run_events',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    runId: integer('run_id')
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    crew: text('crew', { enum: ['EV1', 'EV2'] }).notNull(),
    kind: text('kind').notNull(),
    taskId: integer('task_id'),
    /** seconds of EVA elapsed time */
    at: real('at').notNull(),
    text: text('text'),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamps.createdAt,
  },
  (t) => [index('run_events_run_idx').on(t.runId)],
);
