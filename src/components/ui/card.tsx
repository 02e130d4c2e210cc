import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

interface PanelProps {
  title?: string;
  /** heading level, so the page outline stays in order */
  level?: 2 | 3;
  actions?: ReactNode;
  className?: string;
  /** tighter padding, for a screen that shows many panels at once */
  dense?: boolean;
  children: ReactNode;
}

export function Panel({ title, level = 2, actions, className, dense = false, children }: PanelProps) {
  const Heading = level === 2 ? 'h2' : 'h3';
  return (
    <section className={cn('rounded-lg border border-surface-line bg-surface-panel shadow-sm', className)}>
      {(title || actions) && (
        <header
          className={cn(
            'flex items-center justify-between gap-4 border-b border-surface-line',
            dense ? 'px-4 py-2' : 'px-5 py-3',
          )}
        >
          {title && <Heading className="text-base font-semibold text-text-strong">{title}</Heading>}
          {actions && <div className="flex items-center gap-2">{actions}</div>}
        </header>
      )}
      <div className={dense ? 'px-4 py-3' : 'px-5 py-4'}>{children}</div>
    </section>
  );
}

export function EmptyState({ children }: { children: ReactNode }) {
  return <p className="text-sm text-text-muted">{children}</p>;
}
