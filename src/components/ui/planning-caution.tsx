import { PLANNING_CAUTION } from '@shared/caution';
import { cn } from '@/lib/cn';

export const PLANNING_CAUTION_TEXT = PLANNING_CAUTION;

/** `compact`: one tight line where a screen needs the height (it wraps when the window is narrow). */
export function PlanningCaution({ className, compact = false }: { className?: string; compact?: boolean }) {
  return (
    <aside
      aria-label="Planning caution"
      className={cn(
        'flex gap-3 rounded-md border border-caution/40 bg-caution-soft text-caution',
        compact ? 'px-3 py-1.5 text-xs' : 'px-4 py-3 text-sm',
        className,
      )}
    >
      <span aria-hidden="true" className="font-bold">
        !
      </span>
      <p>{PLANNING_CAUTION_TEXT}</p>
    </aside>
  );
}
