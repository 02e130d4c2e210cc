import type { PlanDetail } from '@shared/schemas/plan-views';
import type { Change } from '@shared/compute/plan-compare';
import { formatElapsed } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { useComparePlan } from '../api/compare-plan';

const when = (c: Change<number>) => `${formatElapsed(c.from)} → ${formatElapsed(c.to)}`;

/** For a resubmitted plan: what changed since the submission before, and what it does to the day. */
export function ChangedSinceSubmission({ plan }: { plan: PlanDetail }) {
  // a plan answered by a review step carries no previousSubmissionVersion until it is read again
  const from = plan.status === 'in-review' ? (plan.previousSubmissionVersion ?? null) : null;
  const compare = useComparePlan(plan.id, from, plan.version);
  const c = compare.data;
  if (from === null || !c) return null;
  const lines = [
    ...c.settings.map((s) => `${s.field}: ${String(s.from)} → ${String(s.to)}`),
    ...c.tasks.added.map((t) => `task added: ${t.title}`),
    ...c.tasks.removed.map((t) => `task removed: ${t.title}`),
    ...c.tasks.changed.map((t) => `task changed: ${t.to.title} (${t.fields.join(', ')})`),
    ...(c.tasks.reordered ? ['tasks reordered'] : []),
    ...c.manifest.added.map((m) => `item added: ${m.name}`),
    ...c.manifest.removed.map((m) => `item removed: ${m.name}`),
    ...c.manifest.changed.map((m) => `item changed: ${m.to.name} (${m.fields.join(', ')})`),
  ];
  return (
    <Alert tone="info" title={`Changed since submission (version ${c.from} → ${c.to})`}>
      {lines.length ? (
        <ul className="list-disc pl-5" aria-label="What changed since the last submission">
          {lines.map((l) => (
            <li key={l}>{l}</li>
          ))}
        </ul>
      ) : (
        <p>Nothing in the tasks, manifest or settings.</p>
      )}
      <p className="mt-2">
        Day end {when(c.day.endSeconds)}; margin {when(c.day.marginSeconds)}.{' '}
        {(['EV1', 'EV2'] as const)
          .map(
            (m) =>
              `${m}: ends ${when(c.day.crew[m].endSeconds)}, swaps ${c.day.crew[m].swapCount.from} → ${c.day.crew[m].swapCount.to}`,
          )
          .join('; ')}
        .
      </p>
    </Alert>
  );
}
