import type { ReactNode } from 'react';
import { NavLink, useMatches } from 'react-router-dom';
import { can, ROLE_LABELS, type Permission } from '@shared/auth/permissions';
import { paths } from '@/config/paths';
import { useSignOut, useUser } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { Button, focusRing } from '../ui/button';
import { BrandMark } from './brand-mark';

interface NavItem {
  label: string;
  to: string;
  permission: Permission;
  end?: boolean;
}

const NAV_ITEMS: NavItem[] = [
  { label: 'Home', to: paths.home.getHref(), permission: 'read', end: true },
  { label: 'Stations', to: paths.stations.getHref(), permission: 'read' },
  { label: 'Plans', to: paths.plans.getHref(), permission: 'read' },
  { label: 'Walkthroughs', to: paths.walkthroughs.getHref(), permission: 'read' },
  { label: 'People', to: paths.people.getHref(), permission: 'users:manage' },
  { label: 'Mailbox', to: paths.mailbox.getHref(), permission: 'mailbox:read' },
];

export function AppLayout({ children }: { children: ReactNode }) {
  const { data: user } = useUser();
  const signOut = useSignOut();
  const items = NAV_ITEMS.filter((item) => can(user, item.permission));
  // a 3D workspace (route handle `workspace`) takes the window's whole width
  const workspace = useMatches().some((m) => (m.handle as { workspace?: boolean } | undefined)?.workspace);

  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only z-50 rounded bg-surface-panel px-3 py-2 text-text-strong focus:not-sr-only focus:absolute focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header className="bg-ink-900 text-ink-100">
        <div
          className={cn(
            'mx-auto flex h-14 items-center gap-6',
            workspace ? 'px-3 sm:px-4' : 'max-w-7xl px-4 sm:px-6',
          )}
        >
          <NavLink to={paths.home.getHref()} className={cn('flex items-center gap-2 rounded', focusRing)}>
            <BrandMark />
            <span className="text-base font-semibold tracking-tight text-white">Tetherwise</span>
          </NavLink>
          <nav aria-label="Main" className="flex flex-1 items-center gap-1">
            {items.map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                end={item.end}
                className={({ isActive }) =>
                  cn(
                    'rounded-md px-3 py-1.5 text-sm font-medium',
                    focusRing,
                    'focus-visible:outline-accent-bright',
                    isActive ? 'bg-ink-700 text-white' : 'text-ink-300 hover:bg-ink-800 hover:text-white',
                  )
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
          {user && (
            <div className="flex items-center gap-3">
              <div className="text-right leading-tight">
                <p className="text-sm font-medium text-white">{user.name}</p>
                <p className="text-xs text-ink-300">{ROLE_LABELS[user.role]}</p>
              </div>
              <Button
                variant="inverse"
                size="sm"
                className="focus-visible:outline-accent-bright"
                isLoading={signOut.isPending}
                onClick={() => signOut.mutate()}
              >
                Sign out
              </Button>
            </div>
          )}
        </div>
      </header>
      <main
        id="main"
        className={cn(
          'mx-auto w-full flex-1',
          workspace ? 'px-3 pt-2 pb-0 sm:px-4' : 'max-w-7xl px-4 py-6 sm:px-6',
        )}
      >
        {children}
      </main>
    </div>
  );
}

export function PageHeader({
  title,
  description,
  actions,
  compact = false,
}: {
  title: string;
  description?: ReactNode;
  actions?: ReactNode;
  /** one tight line over a 3D workspace, which gets the height */
  compact?: boolean;
}) {
  return (
    <div
      className={cn(
        'flex flex-wrap justify-between',
        compact ? 'mb-2 items-center gap-x-4 gap-y-1' : 'mb-6 items-end gap-4',
      )}
    >
      <div className={compact ? 'flex min-w-0 flex-wrap items-baseline gap-x-3' : undefined}>
        <h1 className={cn('font-semibold tracking-tight text-text-strong', compact ? 'text-xl' : 'text-2xl')}>
          {title}
        </h1>
        {description && (
          <p className={cn('text-sm text-text-muted', compact ? '' : 'mt-1 max-w-3xl')}>{description}</p>
        )}
      </div>
      {actions && <div className="flex items-center gap-2">{actions}</div>}
    </div>
  );
}
