import type { ButtonHTMLAttributes, Ref } from 'react';
import { cn } from '@/lib/cn';
import { Spinner } from './spinner';

const VARIANTS = {
  primary: 'bg-accent text-white hover:bg-accent-strong disabled:bg-accent/60',
  secondary:
    'border border-surface-line bg-surface-panel text-text-strong hover:bg-surface-sunken disabled:text-text-muted',
  danger: 'bg-danger text-white hover:bg-danger/90 disabled:bg-danger/60',
  ghost: 'text-text-strong hover:bg-surface-sunken disabled:text-text-muted',
  inverse: 'text-ink-100 hover:bg-ink-700 disabled:text-ink-300',
} as const;

const SIZES = {
  sm: 'h-8 px-3 text-sm',
  md: 'h-10 px-4 text-sm',
} as const;

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: keyof typeof VARIANTS;
  size?: keyof typeof SIZES;
  isLoading?: boolean;
  ref?: Ref<HTMLButtonElement>;
}

export const focusRing =
  'focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent';

export function Button({
  variant = 'primary',
  size = 'md',
  isLoading = false,
  className,
  disabled,
  children,
  type = 'button',
  ...props
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || isLoading}
      aria-busy={isLoading || undefined}
      className={cn(
        'inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed',
        focusRing,
        VARIANTS[variant],
        SIZES[size],
        className,
      )}
      {...props}
    >
      {isLoading && <Spinner size="sm" label="" />}
      {children}
    </button>
  );
}
