import { useEffect, useState } from 'react';
import { nextRunStep } from '@shared/compute/day/run-steps';
import type { CrewMember } from '@shared/schemas/plan';
import type { RunView } from '@shared/schemas/run';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useLogRunEvent } from '../api/log-run';

/** The key that logs each crew member's next step. */
export const CREW_KEYS: Record<CrewMember, string> = { EV1: '1', EV2: '2' };
const CREW: CrewMember[] = ['EV1', 'EV2'];

interface RunLoggerProps {
  run: Pick<RunView, 'run' | 'events' | 'plan'>;
  /** seconds of EVA elapsed time now */
  elapsed: number;
}

/**
 * One key per crew member: it logs that member's next step (out of the airlock, start or done of
 * their next task, ingress) at the clock's time, with the run's version, so two loggers never
 * overwrite each other (the second is told and sees the other's log).
 */
export function RunLogger({ run, elapsed }: RunLoggerProps) {
  const log = useLogRunEvent(run.run.id);
  const [notice, setNotice] = useState<string | null>(null);
  const steps = CREW.map((m) => nextRunStep(run.plan.tasks, run.events, m));

  const press = (crew: CrewMember) => {
    const step = steps[CREW.indexOf(crew)];
    if (!step || log.isPending) return;
    setNotice(null);
    log.mutate(
      {
        runId: run.run.id,
        crew,
        kind: step.kind,
        ...(step.taskId === undefined ? {} : { taskId: step.taskId }),
        at: Math.round(elapsed),
        version: run.run.version,
      },
      {
        onError: (error) =>
          setNotice(
            isApiError(error) && error.status === 409
              ? 'Someone else logged at the same moment: the screen now shows it. Press again if still needed.'
              : `Not logged: ${error.message}`,
          ),
      },
    );
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const target = e.target as HTMLElement | null;
      if (e.repeat || e.ctrlKey || e.metaKey || e.altKey) return;
      if (target && /^(INPUT|TEXTAREA|SELECT)$/.test(target.tagName)) return;
      const crew = CREW.find((m) => CREW_KEYS[m] === e.key);
      if (crew) {
        e.preventDefault();
        press(crew);
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  return (
    <div className="space-y-2">
      <div className="grid gap-3 sm:grid-cols-2">
        {CREW.map((m, i) => {
          const step = steps[i];
          return (
            <Button
              key={m}
              className="h-auto justify-start px-4 py-3 text-left text-base"
              disabled={!step || log.isPending}
              onClick={() => press(m)}
              aria-keyshortcuts={CREW_KEYS[m]}
              data-testid={`log-${m}`}
            >
              <kbd className="mr-3 rounded border border-white/50 px-2 py-0.5 font-mono">{CREW_KEYS[m]}</kbd>
              <span>
                <span className="font-semibold">{m}</span> · {step ? step.label : 'Back inside'}
              </span>
            </Button>
          );
        })}
      </div>
      {notice && (
        <p role="alert" className="text-sm text-danger">
          {notice}
        </p>
      )}
    </div>
  );
}
