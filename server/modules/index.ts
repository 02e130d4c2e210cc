import type { Router } from 'express';
import type { AppContext } from '../context';
import { activityRouter } from './activity/activity.router';
import { authRouter } from './auth/auth.router';
import { healthRouter } from './health/health.router';
import { mailboxRouter } from './mailbox/mailbox.router';
import { usersRouter } from './users/users.router';
import { stationsRouter } from './stations/stations.router';
import { annotationsRouter } from './annotations/annotations.router';
import { computeRouter } from './compute/compute.router';
import { plansRouter } from './plans/plans.router';
import { walkthroughsRouter } from './walkthroughs/walkthroughs.router';
import { seriesRouter } from './series/series.router';
import { runsRouter } from './runs/runs.router';
import { eventsRouter } from './events/events.router';

/** Every API module, mounted in this order. Add a module's router here. */
export const apiModules: ((ctx: AppContext) => Router)[] = [
  healthRouter,
  authRouter,
  usersRouter,
  mailboxRouter,
  activityRouter,
  stationsRouter,
  annotationsRouter,
  computeRouter,
  plansRouter,
  seriesRouter,
  walkthroughsRouter,
  runsRouter,
  eventsRouter,
];
