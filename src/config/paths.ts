const withRedirect = (base: string, redirectTo?: string | null) =>
  redirectTo && redirectTo !== '/' ? `${base}?redirectTo=${encodeURIComponent(redirectTo)}` : base;

export const paths = {
  home: { path: '/', getHref: () => '/' },
  signIn: { path: '/sign-in', getHref: (redirectTo?: string | null) => withRedirect('/sign-in', redirectTo) },
  setPassword: {
    path: '/set-password',
    getHref: (token: string) => `/set-password?token=${encodeURIComponent(token)}`,
  },
  people: { path: '/people', getHref: () => '/people' },
  mailbox: { path: '/mailbox', getHref: () => '/mailbox' },
  stations: { path: '/stations', getHref: () => '/stations' },
  station: {
    path: '/stations/:stationId',
    getHref: (stationId: string | number) => `/stations/${encodeURIComponent(stationId)}`,
  },
  sockets: {
    path: '/stations/:stationId/sockets',
    getHref: (stationId: string | number) => `/stations/${encodeURIComponent(stationId)}/sockets`,
  },
  plans: { path: '/plans', getHref: () => '/plans' },
  plan: {
    path: '/plans/:planId',
    getHref: (planId: string | number) => `/plans/${encodeURIComponent(planId)}`,
  },
  run: {
    path: '/runs/:runId',
    getHref: (runId: string | number) => `/runs/${encodeURIComponent(runId)}`,
  },
  series: {
    path: '/series/:seriesId',
    getHref: (seriesId: string | number) => `/series/${encodeURIComponent(seriesId)}`,
  },
  walkthroughs: {
    path: '/walkthroughs',
    /** with `planId`, the list opens its "new walkthrough" form for that plan */
    getHref: (options: { planId?: number } = {}) =>
      options.planId ? `/walkthroughs?planId=${encodeURIComponent(options.planId)}` : '/walkthroughs',
  },
  walkthrough: {
    path: '/walkthroughs/:id',
    getHref: (id: string | number, options: { step?: number; print?: boolean } = {}) => {
      const query = new URLSearchParams();
      if (options.step) query.set('step', String(options.step));
      if (options.print) query.set('print', '1');
      return `/walkthroughs/${encodeURIComponent(id)}${query.size ? `?${query}` : ''}`;
    },
  },
} as const;

const PROBE_ORIGIN = 'http://tetherwise.invalid';

/**
 * Only same-origin paths: a `redirectTo` from the address bar must not send anyone off-site. The URL
 * parser decides, because it drops tabs and newlines and reads backslashes as slashes.
 */
export function safeRedirectTo(value: string | null | undefined): string {
  const home = paths.home.getHref();
  if (!value || !value.startsWith('/')) return home;
  let url: URL;
  try {
    url = new URL(value, PROBE_ORIGIN);
  } catch {
    return home;
  }
  if (url.origin !== PROBE_ORIGIN || url.pathname === paths.signIn.path) return home;
  return `${url.pathname}${url.search}${url.hash}`;
}
