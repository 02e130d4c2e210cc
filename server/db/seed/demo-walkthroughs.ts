import { count, eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import { plans, users, walkthroughs } from '../schema';
import type { PlanPlayback } from '@shared/schemas/walkthrough';
import { createWalkthrough, updateWalkthrough } from '../../modules/walkthroughs/walkthroughs.service';

export const DEMO_WALKTHROUGH_PLAN = 'External camera boom install';
export const DEMO_WALKTHROUGH_NAME = 'Camera boom day: crew rehearsal';

/**
 * One saved walkthrough of the approved demo plan, by the demo trainer, through the same service
 * as the API, with a few notes on its first steps. Only when no walkthrough exists yet.
 */
export function seedDemoWalkthroughs(ctx: AppContext) {
  if ((ctx.db.select({ n: count() }).from(walkthroughs).get()?.n ?? 0) > 0) return;
  const plan = ctx.db
    .select({ id: plans.id, stationId: plans.stationId })
    .from(plans)
    .where(eq(plans.title, DEMO_WALKTHROUGH_PLAN))
    .get();
  const trainer = ctx.db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(eq(users.email, 'trainer@example.org'))
    .get();
  if (!plan || !trainer) return;
  const created = createWalkthrough(
    ctx,
    { name: DEMO_WALKTHROUGH_NAME, stationId: plan.stationId, planId: plan.id },
    trainer,
  );
  const playback = created.playback as PlanPlayback;
  const notes: Record<string, string> = {};
  const ev1 = playback.crews.EV1.steps;
  const firstSwap = ev1.find((s) => s.type === 'swap');
  const firstWork = ev1.find((s) => s.type === 'work');
  const egress = playback.crews.EV2.steps.find((s) => s.type === 'egress');
  if (egress)
    notes[egress.id] = 'Both crew do the buddy check at the hatch before either leaves the airlock.';
  if (firstSwap)
    notes[firstSwap.id] =
      'Say "new hook on, locked" out loud and wait for the partner to confirm before opening the old hook.';
  if (firstWork)
    notes[firstWork.id] =
      'Stow the bag on the handrail first; keep one hand on the structure while unpacking the boom.';
  if (Object.keys(notes).length === 0) return;
  updateWalkthrough(ctx, created.walkthrough.id, { version: created.walkthrough.version, notes }, trainer);
  ctx.logger.info(`seeded the demo walkthrough "${DEMO_WALKTHROUGH_NAME}"`);
}
