import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { clearMessages, listMessages } from './mailbox.service';

export function mailboxRouter(ctx: AppContext) {
  return mountRoutes('/api/mailbox', [
    defineRoute({ method: 'get', path: '/', access: 'mailbox:read', handler: () => listMessages(ctx.db) }),
    defineRoute({
      method: 'delete',
      path: '/',
      access: 'mailbox:read',
      handler: () => {
        clearMessages(ctx.db);
      },
    }),
  ]);
}
