import { cn } from '@/lib/cn';

const SIZES = { sm: 'size-4 border-2', md: 'size-6 border-2', lg: 'size-10 border-[3px]' } as const;

export function Spinner({ size = 'md', label = 'Loading' }: { size?: keyof typeof SIZES; label?: string }) {
  return (
    <span role={label ? 'status' : undefined} className="inline-flex items-center gap-2">
      <span
        aria-hidden="true"
        className={cn('animate-spin rounded-full border-current border-r-transparent', SIZES[size])}
      />
      {label && <span className="sr-only">{label}</span>}
    </span>
  );
}

export function PageSpinner() {
  return (
    <div className="flex min-h-[50vh] items-center justify-center text-accent">
      <Spinner size="lg" />
    </div>
  );
}
