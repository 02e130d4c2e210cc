import { ToggleChip } from './toggle-chip';

/** Another task of the plan, as the "starts after" choice lists it. */
export interface OtherTask {
  /** unsaved tasks have none yet, and cannot be named until the plan is saved */
  id?: number;
  title: string;
  position: number;
  /** it waits (perhaps through others) for the task being edited: choosing it would make a loop */
  waitsForThis: boolean;
}

/** The tasks a task starts after: chips of the plan's other tasks. */
export function AfterChips({
  value,
  onChange,
  others,
}: {
  value: number[];
  onChange: (ids: number[]) => void;
  others: readonly OtherTask[];
}) {
  return (
    <fieldset>
      <legend className="mb-1.5 text-sm font-medium text-text-strong">Starts after</legend>
      {others.length === 0 ? (
        <p className="text-sm text-text-muted">No other tasks yet.</p>
      ) : (
        <div className="flex flex-wrap gap-2">
          {others.map((o) => {
            const on = o.id !== undefined && value.includes(o.id);
            const why = o.id === undefined ? 'saving' : o.waitsForThis ? 'waits for this one' : null;
            return (
              <ToggleChip
                key={`${o.position}-${o.id ?? 'new'}`}
                on={on}
                disabled={why !== null && !on}
                title={why === 'saving' ? 'A new task can be chosen once the plan is saved' : undefined}
                onToggle={() => onChange(on ? value.filter((id) => id !== o.id) : [...value, o.id!])}
              >
                {o.position}. {o.title}
                {why && <span className="ml-1 text-text-muted">({why})</span>}
              </ToggleChip>
            );
          })}
        </div>
      )}
      <p className="mt-1 text-xs text-text-muted">
        Its work starts only once these have ended; the crew member waits at the worksite if need be.
      </p>
    </fieldset>
  );
}
