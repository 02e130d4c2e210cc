import type { Role } from '../../shared/auth/permissions';

declare global {
  namespace Express {
    interface Request {
      /** the signed-in user, set by the session middleware */
      user?: { id: number; email: string; name: string; role: Role; tokenVersion: number };
    }
  }
}

export {};
