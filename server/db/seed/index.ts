import type { AppContext } from '../../context';
import { seedDemoPlans } from './demo-plans';
import { seedDemoStation } from './demo-station';
import { seedDemoUsers } from './demo-users';
import { seedDemoWalkthroughs } from './demo-walkthroughs';

/**
 * Seeding runs at every start and is idempotent: demo users only into an empty users table, and
 * (unless SEED_DEMO=0) the demo content only when the database has no station yet.
 * Demo content steps are added to `demoContentSteps` in order (station first, then plans, …).
 */
export type SeedStep = (ctx: AppContext) => void | Promise<void>;
export const demoContentSteps: SeedStep[] = [];
demoContentSteps.push(seedDemoStation);
demoContentSteps.push(seedDemoPlans);
// keep last: it rehearses a demo plan, so it runs after the plans step
demoContentSteps.push(seedDemoWalkthroughs);

export async function seedDatabase(ctx: AppContext) {
  const addedUsers = seedDemoUsers(ctx.db);
  if (addedUsers) ctx.logger.info('seeded the demo users');
  if (!ctx.config.seedDemo) return;
  for (const step of demoContentSteps) await step(ctx);
}
