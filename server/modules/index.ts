import type { Router } from 'express';
import type { AppContext } from '../context';
import { activityRouter } from './activity/activity.router';
import { authRouter } from './auth/auth.router';
import { healthRouter } from './health/health.router';
import { mailboxRouter } from './mailbox/mailbox.router';
import { usersRouter } from './users/users.router';

/** Every API module, mounted in this order. Add a module's router here. */
export const apiModules: ((ctx: AppContext) => Router)[] = [
  healthRouter,
  authRouter,
  usersRouter,
  mailboxRouter,
  activityRouter,
];
