import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

const TONES = {
  info: 'border-accent/40 bg-accent-soft text-accent-strong',
  success: 'border-status-approved/40 bg-status-approved-soft text-status-approved',
  caution: 'border-caution/40 bg-caution-soft text-caution',
  danger: 'border-danger/40 bg-danger-soft text-danger',
} as const;

interface AlertProps {
  tone?: keyof typeof TONES;
  title?: string;
  children?: ReactNode;
  className?: string;
  /** one tight line, where a screen needs the height */
  compact?: boolean;
}

export function Alert({ tone = 'info', title, children, className, compact = false }: AlertProps) {
  return (
    <div
      role={tone === 'danger' ? 'alert' : 'status'}
      className={cn(
        'rounded-md border text-sm',
        compact ? 'px-3 py-1.5' : 'px-4 py-3',
        TONES[tone],
        className,
      )}
    >
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className={cn(title && 'mt-1')}>{children}</div>}
    </div>
  );
}
