import { count, eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import { plans, stations, users } from '../schema';
import { CreatePlanInputSchema, type CreatePlanInput } from '@shared/schemas/plan';
import { createPlan, reviewTransition, type Actor } from '../../modules/plans/plans.service';
import { insertSeries } from '../../modules/series/series.service';

export const DEMO_STATION_NAME = 'Kestrel Station';

const min = (m: number) => m * 60;

/**
 * The invented demo plans on Kestrel Station: a draft, and an approved EVA with its follow-up EVA as a series. Crew names are invented; durations are plausible
 * planning numbers, not from any real EVA. Each carries its hardware the way a team would: a
 * portable foot restraint installed before the task that stands in it, tools in the hands of whoever
 * uses them, a portable tether anchor set up early for the later translations, and a large item one
 * crew member carries out and hands to the other. The pump swap uses the station's arm the way a team
 * would: a foot restraint fitted on its end, a ride to a survey point no socket reaches, and the
 * spare pump handed from the arm's rider to the partner. Each has one eclipse-only connector task, and the
 * orbit phase at start is chosen so that task falls in orbital night.
 */
export function demoPlanInputs(stationId: number): {
  draft: CreatePlanInput;
  approved: CreatePlanInput;
  followUp: CreatePlanInput;
} {
  const draft = CreatePlanInputSchema.parse({
    title: 'Coolant pump module swap',
    stationId,
    date: '2031-06-12',
    crew: {
      EV1: { name: 'Mara Quist', tetherLengthM: 25.9 },
      EV2: { name: 'Idris Vanterpool', tetherLengthM: 25.9 },
    },
    routeMode: 'balanced',
    orbitPhaseAtStartDeg: 20,
    tasks: [
      {
        title: 'Set up the portable anchor on the core module',
        worksite: 'CORE-W01',
        crew: 'EV2',
        durationSeconds: min(5),
        actions: [{ do: 'install', item: 'anchor-1', at: 'CORE-J03' }],
      },
      {
        title: "Fit the foot restraint on the arm's end",
        worksite: 'CORE-W01',
        crew: 'EV2',
        durationSeconds: min(10),
        actions: [{ do: 'install', item: 'arm-restraint', at: 'ARM-1' }],
        notes: 'The arm is parked with its end beside the core module.',
      },
      {
        title: 'Install the foot restraint at the pump module',
        worksite: 'SB3-W01',
        crew: 'EV1',
        durationSeconds: min(10),
        actions: [{ do: 'install', item: 'restraint-1', at: 'SB3-S05' }],
      },
      {
        title: 'Demate the pump power connectors',
        worksite: 'SB1-W01',
        crew: 'EV1',
        durationSeconds: min(15),
        eclipseOnly: true,
        tools: ['connector-tool'],
        notes: 'Connectors carry array power: orbital night only.',
      },
      {
        title: 'Remove the failed pump module',
        worksite: 'SB3-W01',
        crew: 'both',
        durationSeconds: min(45),
        sockets: { EV1: 'SB3-S05' },
        tools: ['driver'],
        actions: [{ do: 'pick-up', item: 'failed-pump', by: 'EV2' }],
      },
      {
        title: 'Stow the failed pump on the platform',
        worksite: 'CB-W01',
        crew: 'EV2',
        durationSeconds: min(25),
        actions: [
          { do: 'set-down', item: 'failed-pump' },
          { do: 'pick-up', item: 'spare-pump' },
        ],
      },
      {
        title: 'Survey the forward mast from the arm',
        worksite: 'SB1-W02',
        crew: 'EV2',
        durationSeconds: min(15),
        arm: { key: 'ARM-1', ingress: 'CB-A05' },
        notes:
          'No handrail or socket reaches the survey point: the arm carries EV2 there, spare pump in hand.',
      },
      {
        title: 'Hand the spare pump up',
        worksite: 'SB3-W01',
        crew: 'both',
        durationSeconds: min(10),
        sockets: { EV1: 'SB3-S05' },
        arm: { key: 'ARM-1', ingress: 'CB-A05', egress: 'SB3-A01', rider: 'EV2' },
        actions: [{ do: 'hand-over', item: 'spare-pump', by: 'EV2' }],
      },
      {
        title: 'Install the spare pump module',
        worksite: 'SB3-W01',
        crew: 'EV1',
        durationSeconds: min(40),
        socket: 'SB3-S05',
        tools: ['driver'],
        actions: [{ do: 'set-down', item: 'spare-pump' }],
      },
      {
        title: 'Take the foot restraint down',
        worksite: 'SB3-W01',
        crew: 'EV1',
        durationSeconds: min(10),
        actions: [{ do: 'remove', item: 'restraint-1', at: 'SB3-S05' }],
      },
      {
        title: 'Take the portable anchor down',
        worksite: 'CORE-W01',
        crew: 'EV2',
        durationSeconds: min(5),
        actions: [{ do: 'remove', item: 'anchor-1', at: 'CORE-J03' }],
      },
    ],
    manifest: [
      { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' },
      { key: 'connector-tool', name: 'Connector tool', kind: 'tool', carriedBy: 'EV1' },
      { key: 'restraint-1', name: 'Portable foot restraint', kind: 'foot-restraint', carriedBy: 'EV1' },
      { key: 'anchor-1', name: 'Portable tether anchor', kind: 'tether-anchor', carriedBy: 'EV2' },
      {
        key: 'arm-restraint',
        name: 'Arm foot restraint',
        kind: 'foot-restraint',
        carriedBy: 'EV2',
        leaveOutside: true,
        notes: "Stays on the arm's end for the next EVA.",
      },
      {
        key: 'failed-pump',
        name: 'Failed pump module',
        kind: 'large-item',
        startsAt: 'SB3-W01',
        leaveOutside: true,
        notes: 'Stays on the platform for disposal on a later EVA.',
      },
      {
        key: 'spare-pump',
        name: 'Spare pump module',
        kind: 'large-item',
        startsAt: 'CB-W01',
        leaveOutside: true,
        notes: 'Installed on the pump module: stays outside.',
      },
    ],
  });
  const approved = CreatePlanInputSchema.parse({
    title: 'External camera boom install',
    stationId,
    date: '2031-04-03',
    startGmt: '2031-04-03T13:05:00Z',
    crew: {
      EV1: { name: 'Lena Harrowgate', tetherLengthM: 25.9 },
      EV2: { name: 'Tariq Olufemi', tetherLengthM: 16.8 },
    },
    routeMode: 'fewest-swaps',
    orbitPhaseAtStartDeg: 348,
    tasks: [
      {
        title: 'Set up the portable anchor at the boom mount',
        worksite: 'PB2-W01',
        crew: 'EV2',
        durationSeconds: min(5),
        carrying: false,
        actions: [{ do: 'install', item: 'anchor-1', at: 'PB2-J11' }],
        notes: 'Saves EV2 a swap on every later pass of the port truss on the shorter tether.',
      },
      {
        title: 'Install the foot restraint at the boom mount',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(10),
        actions: [{ do: 'install', item: 'restraint-1', at: 'PB2-S05' }],
      },
      {
        title: 'Hand the camera boom up to the mount',
        worksite: 'PB2-W01',
        crew: 'both',
        durationSeconds: min(15),
        sockets: { EV1: 'PB2-S05' },
        actions: [{ do: 'hand-over', item: 'boom', by: 'EV2' }],
      },
      {
        title: 'Bolt the boom to the mount',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(40),
        socket: 'PB2-S05',
        tools: ['driver'],
        actions: [
          { do: 'set-down', item: 'boom' },
          { do: 'set-down', item: 'parts-bag' },
        ],
      },
      {
        title: 'Mate the camera feed connector',
        worksite: 'SB1-W01',
        crew: 'EV2',
        durationSeconds: min(15),
        eclipseOnly: true,
        tools: ['connector-tool'],
        notes: 'The feed runs through the starboard junction box: orbital night only.',
      },
      {
        title: 'Take the portable anchor down',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(5),
        actions: [{ do: 'remove', item: 'anchor-1', at: 'PB2-J11' }],
      },
    ],
    manifest: [
      { key: 'boom', name: 'Camera boom', kind: 'large-item', carriedBy: 'EV2', leaveOutside: true },
      { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' },
      { key: 'connector-tool', name: 'Connector tool', kind: 'tool', carriedBy: 'EV2' },
      {
        key: 'restraint-1',
        name: 'Portable foot restraint',
        kind: 'foot-restraint',
        carriedBy: 'EV1',
        leaveOutside: true,
        notes: 'Left installed at the boom mount for the next EVA.',
      },
      { key: 'anchor-1', name: 'Portable tether anchor', kind: 'tether-anchor', carriedBy: 'EV2' },
      {
        key: 'parts-bag',
        name: 'Boom parts bag',
        kind: 'bag',
        carriedBy: 'EV1',
        leaveOutside: true,
        notes: 'Staged at the boom mount for the next EVA.',
      },
    ],
  });
  // EVA 2 of the camera boom series: it finds the foot restraint still installed at the boom mount
  // and the parts bag staged there by EVA 1, clamps the boom's cable, checks the aim, and brings
  // both in; the boom itself stays mounted outside
  const followUp = CreatePlanInputSchema.parse({
    title: 'Camera boom cabling and checkout',
    stationId,
    date: '2031-04-05',
    crew: {
      EV1: { name: 'Lena Harrowgate', tetherLengthM: 25.9 },
      EV2: { name: 'Tariq Olufemi', tetherLengthM: 25.9 },
    },
    routeMode: 'fewest-swaps',
    orbitPhaseAtStartDeg: 120,
    tasks: [
      {
        title: 'Clamp the camera cable along the boom',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(30),
        socket: 'PB2-S05',
        tools: ['driver'],
        actions: [{ do: 'pick-up', item: 'parts-bag' }],
        notes: 'The clamps are in the parts bag EVA 1 left at the mount.',
      },
      {
        title: 'Photograph the boom mount and the cable run',
        worksite: 'PB2-W01',
        crew: 'EV2',
        durationSeconds: min(15),
      },
      {
        title: 'Check the camera aim with the ground',
        worksite: 'PB2-W01',
        crew: 'both',
        durationSeconds: min(20),
        sockets: { EV1: 'PB2-S05' },
      },
      {
        title: 'Take the foot restraint out',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(5),
        actions: [{ do: 'remove', item: 'restraint-1', at: 'PB2-S05' }],
      },
    ],
    manifest: [
      {
        key: 'restraint-1',
        name: 'Portable foot restraint',
        kind: 'foot-restraint',
        installedAt: 'PB2-S05',
        notes: 'Installed at the boom mount by EVA 1.',
      },
      {
        key: 'parts-bag',
        name: 'Boom parts bag',
        kind: 'bag',
        startsAt: 'PB2-W01',
        notes: 'Staged at the boom mount by EVA 1.',
      },
      { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' },
    ],
  });
  return { draft, approved, followUp };
}

function demoUser(ctx: AppContext, email: string): Actor | undefined {
  return ctx.db.select({ id: users.id, name: users.name }).from(users).where(eq(users.email, email)).get();
}

/** Runs after the demo station step; does nothing once any plan exists. */
export function seedDemoPlans(ctx: AppContext) {
  if ((ctx.db.select({ n: count() }).from(plans).get()?.n ?? 0) > 0) return;
  const station = ctx.db
    .select({ id: stations.id })
    .from(stations)
    .where(eq(stations.name, DEMO_STATION_NAME))
    .get();
  const planner = demoUser(ctx, 'planner@example.org');
  const planner2 = demoUser(ctx, 'planner2@example.org');
  if (!station || !planner || !planner2) return;
  const { draft, approved, followUp } = demoPlanInputs(station.id);
  createPlan(ctx, draft, planner);
  const camera = createPlan(ctx, approved, planner);
  // through the review steps (without their e-mails) so the audit trail and comments are real
  reviewTransition(
    ctx,
    camera.id,
    'submit',
    camera.version,
    'Ready for review: boom first, connector in the first night pass.',
    planner,
  );
  reviewTransition(
    ctx,
    camera.id,
    'approve',
    camera.version + 1,
    'Checked routes and the night window. Approved.',
    planner2,
  );
  const cabling = createPlan(ctx, followUp, planner);
  // the write only: a seed computes no EVA's day (that would start work on the route workers)
  insertSeries(ctx, { title: 'Camera boom install, two EVAs', planIds: [camera.id, cabling.id] }, planner);
  ctx.logger.info('seeded the demo plans');
}
