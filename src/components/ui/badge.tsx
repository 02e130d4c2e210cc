import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

const TONES = {
  neutral: 'bg-surface-sunken text-text-strong',
  accent: 'bg-accent-soft text-accent-strong',
  draft: 'bg-status-draft-soft text-status-draft',
  review: 'bg-status-review-soft text-status-review',
  approved: 'bg-status-approved-soft text-status-approved',
  caution: 'bg-caution-soft text-caution',
  danger: 'bg-danger-soft text-danger',
} as const;

export type BadgeTone = keyof typeof TONES;

export function Badge({ tone = 'neutral', children }: { tone?: BadgeTone; children: ReactNode }) {
  return (
    <span
      className={cn('inline-flex items-center rounded-full px-2.5 py-0.5 text-xs font-semibold', TONES[tone])}
    >
      {children}
    </span>
  );
}
