import { count, eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import { plans, stations, users } from '../schema';
import { CreatePlanInputSchema, type CreatePlanInput } from '@shared/schemas/plan';
import { createPlan, reviewTransition, type Actor } from '../../modules/plans/plans.service';

export const DEMO_STATION_NAME = 'Kestrel Station';

const min = (m: number) => m * 60;

/**
 * The two invented demo plans on Kestrel Station (DESIGN §7). Crew names are invented; durations
 * are plausible planning numbers, not from any real EVA. Each has one eclipse-only connector task,
 * and the orbit phase at start is chosen so that task falls in orbital night.
 */
export function demoPlanInputs(stationId: number): { draft: CreatePlanInput; approved: CreatePlanInput } {
  const draft = CreatePlanInputSchema.parse({
    title: 'Coolant pump module swap',
    stationId,
    date: '2031-06-12',
    crew: {
      EV1: { name: 'Mara Quist', tetherLengthM: 25.9 },
      EV2: { name: 'Idris Vanterpool', tetherLengthM: 25.9 },
    },
    routeMode: 'balanced',
    orbitPhaseAtStartDeg: 352,
    tasks: [
      {
        title: 'Set up the foot restraint at the pump module',
        worksite: 'SB3-W01',
        crew: 'both',
        durationSeconds: min(20),
        socket: 'SB3-S05',
        tools: ['Foot restraint', 'Pistol grip tool'],
      },
      {
        title: 'Demate the pump power connectors',
        worksite: 'SB1-W01',
        crew: 'EV1',
        durationSeconds: min(15),
        eclipseOnly: true,
        tools: ['Connector tool'],
        notes: 'Connectors carry array power: orbital night only.',
      },
      {
        title: 'Remove the failed pump module',
        worksite: 'SB3-W01',
        crew: 'both',
        durationSeconds: min(45),
        socket: 'SB3-S05',
        tools: ['Pistol grip tool'],
      },
      {
        title: 'Stow the failed pump on the platform',
        worksite: 'CB-W01',
        crew: 'EV2',
        durationSeconds: min(25),
        carrying: true,
        tools: ['Pump bag'],
      },
      {
        title: 'Install the spare pump module',
        worksite: 'SB3-W01',
        crew: 'both',
        durationSeconds: min(45),
        socket: 'SB3-S05',
        carrying: true,
        tools: ['Pistol grip tool'],
      },
    ],
    manifest: [
      { name: 'Pistol grip tool', kind: 'tool', carriedBy: 'EV1', endsAt: 'airlock' },
      { name: 'Connector tool', kind: 'tool', carriedBy: 'EV1', endsAt: 'airlock' },
      { name: 'Foot restraint', kind: 'tool', carriedBy: 'EV2', endsAt: 'airlock' },
      {
        name: 'Pump bag',
        kind: 'bag',
        carriedBy: 'EV2',
        endsAt: 'CB-W01',
        notes: 'Left on the platform with the failed pump.',
      },
    ],
  });
  const approved = CreatePlanInputSchema.parse({
    title: 'External camera boom install',
    stationId,
    date: '2031-04-03',
    crew: {
      EV1: { name: 'Lena Harrowgate', tetherLengthM: 25.9 },
      EV2: { name: 'Tariq Olufemi', tetherLengthM: 16.8 },
    },
    routeMode: 'fewest-swaps',
    orbitPhaseAtStartDeg: 348,
    tasks: [
      {
        title: 'Carry the camera boom to its mount',
        worksite: 'PB2-W01',
        crew: 'both',
        durationSeconds: min(20),
        socket: 'PB2-S05',
        carrying: true,
        tools: ['Boom bag'],
      },
      {
        title: 'Bolt the boom to the mount',
        worksite: 'PB2-W01',
        crew: 'EV1',
        durationSeconds: min(40),
        socket: 'PB2-S05',
        tools: ['Pistol grip tool'],
      },
      {
        title: 'Mate the camera feed connector',
        worksite: 'PB3-W01',
        crew: 'EV2',
        durationSeconds: min(15),
        eclipseOnly: true,
        tools: ['Connector tool'],
      },
      {
        title: 'Check the end light and close out',
        worksite: 'PB4-W01',
        crew: 'EV2',
        durationSeconds: min(15),
      },
    ],
    manifest: [
      { name: 'Boom bag', kind: 'bag', carriedBy: 'EV1', endsAt: 'airlock' },
      { name: 'Pistol grip tool', kind: 'tool', carriedBy: 'EV1', endsAt: 'airlock' },
      { name: 'Connector tool', kind: 'tool', carriedBy: 'EV2', endsAt: 'airlock' },
    ],
  });
  return { draft, approved };
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
  const { draft, approved } = demoPlanInputs(station.id);
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
  ctx.logger.info('seeded the demo plans');
}
