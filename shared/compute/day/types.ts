import type { CrewMember, ManifestItem, ManifestKind, Plan, Task } from '../../schemas/plan';
import type { RouteFeasible, RouteMode, RouteResult } from '../../schemas/route';
import type { ReachResult } from '../../schemas/sockets';
import type { Arm, Hazard, NodeKind, StationSettings, Vec3 } from '../../schemas/station';
import type { OrbitInput, OrbitSummary, OrbitWindow } from '../orbit';

export type { TetherState } from '../../schemas/route';
import type { TetherState } from '../../schemas/route';

/** Where a manifest item is at some moment of the day: exactly one of these. */
export type ItemWhere =
  | { kind: 'airlock' }
  | { kind: 'carried'; crew: CrewMember }
  | { kind: 'at'; node: string }
  | { kind: 'installed'; node: string };

export interface ItemState {
  start: number;
  end: number;
  where: ItemWhere;
}

/** One item through the day: its states tile [0, day end] without gaps or overlaps. */
export interface EquipmentTrack {
  item: string;
  name: string;
  kind: ManifestKind;
  states: ItemState[];
}

/** What the day asks of the route engine: a route from a tether state, with extra attach points. */
export interface DayRouteRequest {
  from: string;
  to: string;
  mode: RouteMode;
  tetherLengthM: number;
  carrying: boolean;
  allowRide: boolean;
  startAnchor: string;
  startPaidOutM: number;
  /** installed portable anchors: attach points for this route */
  extraAttach: string[];
  /** arrive with at most this much tether out (room left to reach an attach point afterwards) */
  endPaidOutMaxM?: number;
}

/** The route engine, injected so the day can be computed against any station version. */
export type DayRouteFn = (request: DayRouteRequest) => RouteResult;

export interface DayNode {
  kind: NodeKind;
  position: Vec3;
  normal?: Vec3;
}

/** What the day needs to know of the station. */
export interface DayStation {
  airlockKey: string;
  orbit: OrbitInput;
  settings: Pick<StationSettings, 'restraintSeconds' | 'reach'>;
  node(key: string): DayNode | undefined;
  /** the station's sockets, for suggesting one that reaches a worksite */
  sockets: readonly { key: string; position: Vec3; normal: Vec3 }[];
  /**
   * Metres from `node` to the nearest attach point (the station's, or one of `extraAttach`) along
   * ways open to a route; 0 at an attach point, null when none can be reached.
   */
  nearestAttachM(node: string, extraAttach: readonly string[], allowRide: boolean): number | null;
  /** the station's robotic arms, with their base positions */
  arms?: readonly DayArm[];
  /** the keep-out volumes an arm's tip must stay clear of */
  keepOut?: readonly Hazard[];
}

export type DayArm = Arm & { base: Vec3 };

export type DayTask = Pick<
  Task,
  | 'id'
  | 'title'
  | 'worksite'
  | 'crew'
  | 'durationSeconds'
  | 'eclipseOnly'
  | 'carrying'
  | 'socket'
  | 'sockets'
  | 'tools'
  | 'actions'
> &
  Partial<Pick<Task, 'arm' | 'after' | 'optional'>>;

export type DayItem = Pick<ManifestItem, 'name' | 'kind' | 'carriedBy' | 'installedAt'> & {
  key: string;
  /** `airlock` (the default) or a node */
  startsAt?: string;
  leaveOutside?: boolean;
};

export type DayPlan = Pick<
  Plan,
  | 'crew'
  | 'routeMode'
  | 'allowRide'
  | 'orbitPhaseAtStartDeg'
  | 'timeLimitSeconds'
  | 'egressSeconds'
  | 'ingressSeconds'
> & {
  betaDegOverride?: number | null;
  tasks: readonly DayTask[];
  manifest: readonly DayItem[];
};

/**
 * The state the day starts from, when it is not the manifest's own: an EVA of a series starts with
 * each item where the EVA before left it (by item key). An item not named here starts where the
 * manifest says. A place outside (`at`, `installed`) puts the item there at egress; `airlock` means
 * it is inside (carried out at egress by the item's `carriedBy`); `carried` is not a start place.
 */
export interface DayStart {
  items?: Readonly<Record<string, ItemWhere>>;
  /** the day as flown so far: the rest is re-projected from it */
  flown?: DayFlown;
}

/** What a crew member was logged doing in one task (seconds of EVA elapsed time). */
export interface FlownWork {
  start?: number;
  end?: number;
  /** started and not done by `now`: it ends no earlier than now */
  inProgress?: boolean;
}

/**
 * The day as flown up to `now`, for re-projecting the rest of it with the same pass. A logged time
 * replaces the planned one; a step with nothing logged that the crew member has moved past keeps
 * its planned length; a step still ahead starts no earlier than `now`.
 */
export interface DayFlown {
  now: number;
  /** when each crew member's egress ended; null: not logged, but they have moved on */
  egressEnd: Partial<Record<CrewMember, number | null>>;
  /** by task id, then crew member: present once the crew member got to the task or past it */
  work: Readonly<Record<number, Partial<Record<CrewMember, FlownWork>>>>;
  /** the shared ingress block, once logged */
  ingress?: FlownWork;
}

export type TimelineBlockType =
  | 'egress'
  | 'translate'
  | 'swap'
  | 'restraint-in'
  | 'work'
  | 'restraint-out'
  | 'wait'
  | 'ingress'
  | 'arm-ride';

export interface TimelineBlock {
  type: TimelineBlockType;
  /** seconds of EVA elapsed time */
  start: number;
  end: number;
  label: string;
  taskIndex?: number;
  taskId?: number;
  /** translate: the stretch of the route this block covers */
  from?: string;
  to?: string;
  /** translate and swap: index into the timeline's `routes`; a translate covers `legs[legStart, legEnd)` */
  routeIndex?: number;
  legStart?: number;
  legEnd?: number;
  /** translate: the tether at the start and at the end of the stretch */
  tetherAtStart?: TetherState;
  tetherAtEnd?: TetherState;
  /** swap: the new hook is clipped at `swapNode`, then the old one released at `releaseNode` */
  swapNode?: string;
  releaseNode?: string;
  /** swap: tether out from the old anchor just before the swap */
  paidOutM?: number;
  /** restraint-in, work, restraint-out: the foot-restraint socket */
  socket?: string;
  /** restraint-in: the restraint's set angles for the task */
  yawSetDeg?: number;
  pitchSetDeg?: number;
  /** work: the crew member could not get to the worksite (see the warnings) */
  unreached?: boolean;
  /**
   * restraint-in, arm-ride, work, restraint-out on an arm: the arm's key. On an arm the crew member is
   * tethered to it (`tetherAtEnd` of the get-in); the get-out clips them back to the station.
   */
  arm?: string;
  /** arm-ride: when the tip arrives; the arm settles from then to `end` */
  travelEnd?: number;
}

/** A move of an arm's tip: a straight line, then the settle time. */
export interface ArmBlock {
  type: 'arm-move';
  start: number;
  end: number;
  /** when the tip arrives; the arm settles from then to `end` */
  travelEnd: number;
  label: string;
  /** node keys of the two ends */
  from: string;
  to: string;
  fromPoint: Vec3;
  toPoint: Vec3;
  /** who stands on the arm's end, if anyone */
  rider?: CrewMember;
  taskIndex?: number;
}

/** One rider's time on an arm: from getting on at `ingress` to getting off at `egress`. */
export interface ArmSession {
  rider: CrewMember;
  start: number;
  end: number;
  ingress: string;
  egress: string;
  /** the plan's tasks done from the arm in this session */
  taskIndexes: number[];
}

/** An arm's lane in the day: its moves and who rides it when. */
export interface ArmLane {
  key: string;
  label?: string;
  base: Vec3;
  /** the arm's shell, to draw it: minReachM ≤ |tip − base| ≤ reachM */
  reachM: number;
  minReachM?: number;
  /** where the tip is at the start of the day (the first session's ingress), null when never used */
  startPoint: Vec3 | null;
  blocks: ArmBlock[];
  sessions: ArmSession[];
}

export interface CrewTimeline {
  crew: CrewMember;
  blocks: TimelineBlock[];
  totalSeconds: number;
  idleSeconds: number;
  workSeconds: number;
  translateSeconds: number;
  swapSeconds: number;
  swapCount: number;
  restraintSeconds: number;
}

export type TimelineWarningCode =
  | 'over-time-limit'
  | 'route-infeasible'
  | 'route-caution'
  | 'route-note'
  | 'eclipse-only-outside-night'
  | 'unknown-worksite'
  | 'unknown-socket'
  | 'socket-out-of-reach'
  | 'socket-unusable'
  | 'restraint-missing'
  | 'restraint-occupied'
  | 'socket-occupied'
  | 'item-not-there'
  | 'item-not-held'
  | 'tool-not-at-hand'
  | 'tool-not-in-manifest'
  | 'unused-tool'
  | 'unknown-start'
  | 'unknown-place'
  | 'left-outside'
  | 'unknown-arm'
  | 'arm-out-of-reach'
  | 'arm-path-keep-out'
  | 'arm-busy'
  | 'arm-egress-not-attach'
  | 'after-out-of-order';

export interface TimelineWarning {
  code: TimelineWarningCode;
  message: string;
  taskIndex?: number;
  crew?: CrewMember;
  /** the manifest item's key, where an item is concerned */
  item?: string;
  /** eclipse-only-outside-night: where the task would fit, when some night window has room */
  nextWindow?: { start: number; end: number; nightStart: number; nightEnd: number };
  /** socket-out-of-reach: sockets of the station that reach the worksite, nearest first */
  reachingSockets?: string[];
  /** arm warnings: the arm's key */
  arm?: string;
}

/** A foot restraint's reach for one crew member's task. */
export interface TaskReach {
  taskIndex: number;
  crew: CrewMember;
  socket: string;
  worksite: string;
  /** null when the socket or the worksite is not a usable node of the station (see the warnings) */
  reach: ReachResult | null;
}

export interface Timeline {
  crew: Record<CrewMember, CrewTimeline>;
  /** every route of the day, once; translate and swap blocks point into it */
  routes: RouteFeasible[];
  /** the station's arms that the day uses: moves and riders */
  arms: ArmLane[];
  equipment: EquipmentTrack[];
  reach: TaskReach[];
  endSeconds: number;
  timeLimitSeconds: number;
  /** time limit − end; negative when the day runs over */
  marginSeconds: number;
  fitsTimeLimit: boolean;
  orbit: OrbitSummary & { betaDeg: number; altitudeKm: number };
  /** across [0, max(time limit, end)] */
  dayWindows: OrbitWindow[];
  nightWindows: OrbitWindow[];
  warnings: TimelineWarning[];
}

/** The tether as a route starts: the engine's start state, else a fresh clip where it starts. */
export function tetherAtRouteStart(route: RouteFeasible): TetherState {
  return route.tetherAtStart ?? { anchor: route.nodes[0], paidOutM: 0 };
}

/** The tether on arrival: the last swap (else the start's anchor) and the metres out since it. */
export function tetherAtRouteEnd(route: RouteFeasible): TetherState {
  if (route.tetherAtEnd) return route.tetherAtEnd;
  const start = tetherAtRouteStart(route);
  const last = route.swaps[route.swaps.length - 1];
  return last
    ? { anchor: last.node, paidOutM: route.lengthM - last.atM }
    : { anchor: start.anchor, paidOutM: start.paidOutM + route.lengthM };
}
