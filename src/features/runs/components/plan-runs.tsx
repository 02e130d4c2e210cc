import { Link, useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { useCan } from '@/lib/authorization';
import { usePlanRuns } from '../api/get-run';
import { useOpenRun } from '../api/log-run';

/** An approved plan's runs, and (for those who fly) a button that starts one on the clock now. */
export function PlanRuns({ planId, runHref }: { planId: number; runHref: (runId: number) => string }) {
  const runs = usePlanRuns(planId);
  const navigate = useNavigate();
  const canFly = useCan('runs:fly');
  const open = useOpenRun({ planId, onSuccess: (run) => navigate(runHref(run.id)) });
  return (
    <Panel
      title="Runs"
      actions={
        canFly && (
          <Button
            size="sm"
            isLoading={open.isPending}
            onClick={() => open.mutate({ planId, startedAt: new Date().toISOString() })}
          >
            Start a run now
          </Button>
        )
      }
    >
      {runs.data?.length ? (
        <ul className="space-y-1 text-sm">
          {runs.data.map((r) => (
            <li key={r.id}>
              <Link className="text-accent-strong underline" to={runHref(r.id)}>
                Run {r.id}
              </Link>{' '}
              started {r.startedAt.slice(0, 16).replace('T', ' ')} GMT by {r.openedBy ?? 'someone'}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-text-muted">Not flown yet.</p>
      )}
    </Panel>
  );
}
