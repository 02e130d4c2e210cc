import { useMemo, useState, type ReactNode } from 'react';
import { SocketPlanRequestSchema } from '@shared/schemas/sockets';
import { parseLength, type LengthUnit } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { apiErrorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import type { PlanTarget } from '../lib/planned-sockets';
import type { SocketPlanner } from '../lib/use-socket-planner';

const checkbox = cn('accent-accent', focusRing);

const toggle = (set: ReadonlySet<string>, key: string, on: boolean) => {
  const next = new Set(set);
  if (on) next.add(key);
  else next.delete(key);
  return next;
};

/** A list item that is one labelled checkbox. */
function CheckItem({
  checked,
  onChange,
  className,
  children,
}: {
  checked: boolean;
  onChange: (on: boolean) => void;
  className: string;
  children: ReactNode;
}) {
  return (
    <li>
      <label className={className}>
        <input
          type="checkbox"
          className={checkbox}
          checked={checked}
          onChange={(e) => onChange(e.target.checked)}
        />
        {children}
      </label>
    </li>
  );
}

interface SocketPlannerControlsProps {
  planner: SocketPlanner;
  /** this station's plans, to take targets from their tasks' worksites */
  plans: readonly { id: number; title: string }[];
  loadPlanWorksites: (planId: number) => Promise<string[]>;
}

/** What to plan for: worksites, a plan's worksites, points on the model; which candidates; a grid. */
export function SocketPlannerControls({ planner, plans, loadPlanWorksites }: SocketPlannerControlsProps) {
  const { station, nodesByKey } = planner;
  const worksites = useMemo(() => station.nodes.filter((n) => n.kind === 'worksite'), [station.nodes]);
  const sockets = useMemo(
    () => station.nodes.filter((n) => n.kind === 'socket' && n.normal),
    [station.nodes],
  );
  const [chosenWorksites, setChosenWorksites] = useState<ReadonlySet<string>>(new Set());
  const [excluded, setExcluded] = useState<ReadonlySet<string>>(new Set());
  const [gridOn, setGridOn] = useState(false);
  const [gridText, setGridText] = useState('1');
  const [unit, setUnit] = useState<LengthUnit>('m');
  const [planId, setPlanId] = useState('');
  const [planNote, setPlanNote] = useState<string | null>(null);
  const [problems, setProblems] = useState<string[]>([]);

  const targets: PlanTarget[] = [
    ...worksites
      .filter((w) => chosenWorksites.has(w.key))
      .map((w) => ({ label: w.key, position: w.position, nodeKey: w.key })),
    ...planner.picked,
  ];

  const addPlanWorksites = async () => {
    const id = Number(planId);
    if (!id) return;
    setPlanNote(null);
    try {
      const keys = await loadPlanWorksites(id);
      const known = keys.filter((k) => nodesByKey.get(k)?.kind === 'worksite');
      setChosenWorksites((s) => new Set([...s, ...known]));
      setPlanNote(
        known.length
          ? `Added ${new Set(known).size} worksite${new Set(known).size === 1 ? '' : 's'} from the plan's tasks.`
          : 'That plan has no task at a worksite of this station.',
      );
    } catch (error) {
      setPlanNote(apiErrorMessage(error, 'The plan could not be loaded.'));
    }
  };

  const submit = () => {
    const spacing = gridOn ? parseLength(gridText, unit) : null;
    const found: string[] = [];
    if (spacing && !spacing.ok) found.push(`Grid spacing: ${spacing.message}.`);
    const candidates = sockets.filter((s) => !excluded.has(s.key)).map((s) => s.key);
    if (candidates.length === 0 && !gridOn)
      found.push('Choose at least one candidate socket, or add grid candidates.');
    const request = {
      targets: targets.map((t) => t.position),
      // every socket listed is the same as none listed, and shorter
      // an empty list with a grid means new sockets only
      ...(excluded.size > 0 ? { candidates } : {}),
      ...(spacing?.ok ? { gridSpacingM: spacing.value } : {}),
    };
    const checked = SocketPlanRequestSchema.safeParse(request);
    if (!checked.success) {
      for (const issue of checked.error.issues)
        found.push(
          issue.path[0] === 'gridSpacingM' ? `Grid spacing: ${issue.message}.` : `${issue.message}.`,
        );
    }
    setProblems(found);
    if (found.length || !checked.success) return;
    planner.start({ request: checked.data, targets, unit });
  };

  return (
    <div className="space-y-5">
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-text-strong">Targets: worksites</legend>
        {worksites.length === 0 ? (
          <p className="text-sm text-text-muted">
            This station has no worksites; pick points on the model instead.
          </p>
        ) : (
          <ul className="max-h-48 space-y-1 overflow-y-auto">
            {worksites.map((w) => (
              <CheckItem
                key={w.key}
                className="flex items-baseline gap-2 text-sm text-text-strong"
                checked={chosenWorksites.has(w.key)}
                onChange={(on) => setChosenWorksites((s) => toggle(s, w.key, on))}
              >
                <span className="font-mono font-semibold">{w.key}</span>
                {w.label && <span className="truncate text-xs text-text-muted">{w.label}</span>}
              </CheckItem>
            ))}
          </ul>
        )}
      </fieldset>

      <div className="space-y-1.5">
        <label htmlFor="socket-plan-plan" className="block text-sm font-semibold text-text-strong">
          Targets from a plan&apos;s tasks
        </label>
        <div className="space-y-2">
          <Select
            id="socket-plan-plan"
            value={planId}
            onChange={(e) => setPlanId(e.target.value)}
            options={[
              { value: '', label: plans.length ? 'Choose a plan…' : 'No plan uses this station' },
              ...plans.map((p) => ({ value: String(p.id), label: p.title })),
            ]}
          />
          <Button variant="secondary" disabled={!planId} onClick={() => void addPlanWorksites()}>
            Add its worksites
          </Button>
        </div>
        {planNote && (
          <p role="status" className="text-xs text-text-muted">
            {planNote}
          </p>
        )}
      </div>

      <div className="space-y-2">
        <div className="flex items-center justify-between gap-2">
          <span className="text-sm font-semibold text-text-strong">Targets: points on the model</span>
          <Button
            size="sm"
            variant={planner.picking ? 'primary' : 'secondary'}
            aria-pressed={planner.picking}
            onClick={planner.togglePicking}
          >
            {planner.picking ? 'Picking: click the model' : 'Pick points'}
          </Button>
        </div>
        {planner.picked.length > 0 && (
          <ul className="space-y-1">
            {planner.picked.map((p, i) => (
              <li key={p.label} className="flex items-center justify-between gap-2 text-sm">
                <span>
                  <span className="font-semibold">{p.label}</span>{' '}
                  <span className="text-xs text-text-muted tabular-nums">
                    ({p.position.map((v) => v.toFixed(2)).join(', ')}) m
                  </span>
                </span>
                <Button
                  size="sm"
                  variant="ghost"
                  aria-label={`Remove ${p.label}`}
                  onClick={() => planner.removePicked(i)}
                >
                  Remove
                </Button>
              </li>
            ))}
          </ul>
        )}
      </div>

      <details className="rounded-md border border-surface-line px-3 py-2">
        <summary className={cn('cursor-pointer rounded text-sm font-semibold text-text-strong', focusRing)}>
          Candidate sockets ({sockets.length - excluded.size} of {sockets.length})
        </summary>
        <div className="mt-2 flex gap-2">
          <Button size="sm" variant="secondary" onClick={() => setExcluded(new Set())}>
            All
          </Button>
          <Button
            size="sm"
            variant="secondary"
            onClick={() => setExcluded(new Set(sockets.map((s) => s.key)))}
          >
            None
          </Button>
        </div>
        <ul className="mt-2 grid max-h-48 grid-cols-2 gap-1 overflow-y-auto">
          {sockets.map((s) => (
            <CheckItem
              key={s.key}
              className="flex items-center gap-2 font-mono text-xs text-text-strong"
              checked={!excluded.has(s.key)}
              onChange={(on) => setExcluded((x) => toggle(x, s.key, !on))}
            >
              {s.key}
            </CheckItem>
          ))}
        </ul>
      </details>

      <div className="space-y-1.5">
        <label className="flex items-center gap-2 text-sm font-semibold text-text-strong">
          <input
            type="checkbox"
            className={checkbox}
            checked={gridOn}
            onChange={(e) => setGridOn(e.target.checked)}
          />
          Add grid candidates over truss faces
        </label>
        <div className="flex items-center gap-2">
          <label htmlFor="socket-plan-grid" className="text-sm whitespace-nowrap text-text-strong">
            Grid spacing
          </label>
          <Input
            id="socket-plan-grid"
            className="w-24"
            inputMode="decimal"
            disabled={!gridOn}
            value={gridText}
            onChange={(e) => setGridText(e.target.value)}
          />
          <Select
            aria-label="Grid spacing unit"
            className="w-20"
            disabled={!gridOn}
            value={unit}
            onChange={(e) => setUnit(e.target.value as LengthUnit)}
            options={[
              { value: 'm', label: 'm' },
              { value: 'ft', label: 'ft' },
            ]}
          />
        </div>
      </div>

      {problems.length > 0 && (
        <Alert tone="danger" title="Cannot plan yet">
          <ul className="list-disc pl-4">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </Alert>
      )}
      <Button onClick={submit} isLoading={planner.plan.isFetching} disabled={targets.length === 0}>
        Plan sockets for {targets.length} target{targets.length === 1 ? '' : 's'}
      </Button>
    </div>
  );
}
