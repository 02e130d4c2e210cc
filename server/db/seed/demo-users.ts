import bcrypt from 'bcryptjs';
import { sql } from 'drizzle-orm';
import type { Db } from '../client';
import { users } from '../schema';
import type { Role } from '@shared/auth/permissions';
import { BCRYPT_COST } from '../../modules/auth/auth.service';

/** The one demo password, documented in the README. */
export const DEMO_PASSWORD = 'tetherwise-demo';

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'admin@example.org', name: 'Ada Okafor', role: 'admin' },
  { email: 'planner@example.org', name: 'Priya Lindqvist', role: 'planner' },
  { email: 'planner2@example.org', name: 'Tomas Reyes', role: 'planner' },
  { email: 'engineer@example.org', name: 'Mei Hartmann', role: 'engineer' },
  { email: 'trainer@example.org', name: 'Jonah Abara', role: 'trainer' },
  { email: 'viewer@example.org', name: 'Sofia Brandt', role: 'viewer' },
];

/** Adds the demo users to an empty database only: an existing team's people are never touched. */
export function seedDemoUsers(db: Db): boolean {
  const count =
    db
      .select({ n: sql<number>`count(*)` })
      .from(users)
      .get()?.n ?? 0;
  if (count > 0) return false;
  const hash = bcrypt.hashSync(DEMO_PASSWORD, BCRYPT_COST);
  db.transaction((tx) => {
    for (const u of DEMO_USERS)
      tx.insert(users)
        .values({ ...u, passwordHash: hash })
        .run();
  });
  return true;
}
