import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';

export function healthRouter(_ctx: AppContext) {
  return mountRoutes('/api', [
    defineRoute({ method: 'get', path: '/health', access: 'public', handler: () => ({ ok: true }) }),
  ]);
}
