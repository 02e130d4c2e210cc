import { PLANNING_CAUTION } from '@shared/caution';
import { cn } from '@/lib/cn';

export const PLANNING_CAUTION_TEXT = PLANNING_CAUTION;

export function PlanningCaution({ className }: { className?: string }) {
  return (
    <aside
      aria-label="Planning caution"
      className={cn(
        'flex gap-3 rounded-md border border-caution/40 bg-caution-soft px-4 py-3 text-sm text-caution',
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
