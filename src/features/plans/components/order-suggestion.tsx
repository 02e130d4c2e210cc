import { useState } from 'react';
import { formatElapsed } from '@shared/compute/units';
import type { OrderSummary, PlanSequence } from '@shared/schemas/sequence';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { Table, Td, Th } from '@/components/ui/table';
import { useSuggestOrder } from '../api/suggest-order';
import type { PlanDraft } from '../lib/plan-draft';

type DraftTask = PlanDraft['tasks'][number];

const signed = (s: number) => (s < 0 ? `−${formatElapsed(-s)}` : `+${formatElapsed(s)}`);

const ROWS: { label: string; value: (o: OrderSummary) => string }[] = [
  { label: 'Day ends', value: (o) => formatElapsed(o.endSeconds) },
  { label: 'Margin to the limit', value: (o) => signed(o.marginSeconds) },
  { label: 'Tether swaps', value: (o) => String(o.swapCount) },
  { label: 'Waiting (both crew)', value: (o) => formatElapsed(o.waitSeconds) },
  { label: 'Warnings', value: (o) => String(o.warningCount) },
];

/** The tasks in the proposal's order, by id; null when the draft no longer has exactly those tasks. */
export function reorderedTasks(tasks: readonly DraftTask[], ids: readonly number[]): DraftTask[] | null {
  const byId = new Map(tasks.map((t) => [t.id, t]));
  if (ids.length !== tasks.length || ids.some((id) => !byId.has(id))) return null;
  return ids.map((id) => byId.get(id)!);
}

function OrderList({ title, tasks, moved }: { title: string; tasks: DraftTask[]; moved?: Set<number> }) {
  return (
    <div className="min-w-0 flex-1">
      <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-text-muted">{title}</h3>
      <ol className="list-decimal space-y-0.5 pl-5 text-sm">
        {tasks.map((t) => (
          <li
            key={t.id}
            className={moved?.has(t.id!) ? 'font-semibold text-accent-strong' : 'text-text-strong'}
          >
            {t.title} <span className="text-xs font-normal text-text-muted">{t.crew}</span>
          </li>
        ))}
      </ol>
    </div>
  );
}

interface OrderSuggestionProps {
  planId: number;
  tasks: readonly DraftTask[];
  /** the draft is saved and may be edited: a proposal is for the saved order and can be applied */
  canApply: boolean;
  /** whether the draft has changes not saved yet */
  unsaved: boolean;
  onApply: (tasks: DraftTask[]) => void;
}

/**
 * "Suggest an order": the server's proposal for the saved plan beside the current order (day end,
 * margin, swaps, waits, warnings), applied as one edit of the task order and undone the same way.
 */
export function OrderSuggestion({ planId, tasks, canApply, unsaved, onApply }: OrderSuggestionProps) {
  const suggest = useSuggestOrder();
  const [before, setBefore] = useState<DraftTask[] | null>(null);
  const proposal: PlanSequence | undefined = suggest.data;
  const proposed = proposal ? reorderedTasks(tasks, proposal.tasks) : null;
  const same = proposed !== null && proposed.every((t, i) => t === tasks[i]);
  const moved = new Set(
    proposed?.flatMap((t, i) => (t !== tasks[i] && t.id !== undefined ? [t.id] : [])) ?? [],
  );
  const gain = proposal ? proposal.currentEndSeconds - proposal.endSeconds : 0;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2">
        <Button
          variant="secondary"
          size="sm"
          isLoading={suggest.isPending}
          disabled={unsaved || tasks.length === 0}
          onClick={() => {
            setBefore(null);
            suggest.mutate(planId);
          }}
        >
          Suggest an order
        </Button>
        {unsaved && (
          <span className="text-xs text-text-muted">
            Save the plan first: the search orders the saved tasks.
          </span>
        )}
        {suggest.isPending && <span className="text-xs text-text-muted">Searching orders (up to 2 s)…</span>}
      </div>
      <FormError error={suggest.error} fallback="No order could be suggested." />
      {proposal && (
        <section aria-label="Suggested order" className="space-y-3">
          <PlanningCaution />
          <div className="flex flex-wrap items-center gap-2 text-sm">
            {proposal.exact ? (
              <Badge tone="approved">Proved earliest</Badge>
            ) : (
              <Badge tone="caution">Best found, not proved</Badge>
            )}
            <span className="text-text-muted">
              {proposal.explored.toLocaleString('en')} days computed in {proposal.seconds.toFixed(1)} s
            </span>
          </div>
          <p className="text-sm text-text-strong">
            {before
              ? 'The suggested order is applied to the task list (one edit, saved as usual); undo puts the previous order back.'
              : same || gain <= 0
                ? 'The current order already ends the day as early as any order found that keeps every “after”, the night work and the equipment rules.'
                : `This order ends the day ${formatElapsed(gain)} earlier, keeping every “after”, the night work and the equipment rules, and adding no warning.`}
          </p>
          <Table caption="Current order beside the suggestion">
            <thead>
              <tr>
                <Th> </Th>
                <Th>Current</Th>
                <Th>Suggested</Th>
              </tr>
            </thead>
            <tbody>
              {ROWS.map((row) => (
                <tr key={row.label}>
                  <Td className="font-medium text-text-strong">{row.label}</Td>
                  <Td>{row.value(proposal.current)}</Td>
                  <Td>{row.value(proposal.proposal)}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
          {proposed && !same && (
            <div className="flex gap-4">
              <OrderList title="Current" tasks={[...tasks]} />
              <OrderList title="Suggested" tasks={proposed} moved={moved} />
            </div>
          )}
          {!proposed && !before && (
            <p className="text-sm text-text-muted">The tasks changed since the suggestion: ask again.</p>
          )}
          <div className="flex flex-wrap gap-2">
            {proposed && !same && canApply && (
              <Button
                size="sm"
                onClick={() => {
                  setBefore([...tasks]);
                  onApply(proposed);
                }}
              >
                Apply this order
              </Button>
            )}
            {before && canApply && (
              <Button
                variant="secondary"
                size="sm"
                onClick={() => {
                  onApply(before);
                  setBefore(null);
                  suggest.reset();
                }}
              >
                Undo the new order
              </Button>
            )}
          </div>
        </section>
      )}
    </div>
  );
}
