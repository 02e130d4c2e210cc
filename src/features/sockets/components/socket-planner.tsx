import { useMemo, useState, type ReactNode } from 'react';
import type { QueryKey } from '@tanstack/react-query';
import {
  SocketPlanRequestSchema,
  type AcceptSocketPlanResult,
  type SocketPlanRequest,
} from '@shared/schemas/sockets';
import type { NodeKind, Vec3 } from '@shared/schemas/station';
import { formatLength, parseLength, type LengthUnit } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { apiErrorMessage, staleVersionOf } from '@/lib/api-client';
import { useCan } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { useAcceptSocketPlan } from '../api/accept-socket-plan';
import { useSocketPlan } from '../api/get-socket-plan';
import {
  assignmentRows,
  exactnessText,
  newSocketsToAccept,
  plannedSocketViews,
  type PlanTarget,
} from '../lib/planned-sockets';
import { PickedPointsOverlay, SocketPlanOverlay, type SocketScenePieces } from './socket-overlay';
import { SocketPlanTable } from './socket-plan-table';

export interface SocketPlannerStation {
  id: number;
  version: number;
  reach: { standOffM: number; radiusM: number };
  nodes: readonly { key: string; kind: NodeKind; label?: string; position: Vec3; normal?: Vec3 }[];
}

export interface SocketPlannerOptions {
  /** this station's plans, to take targets from their tasks' worksites */
  plans: readonly { id: number; title: string }[];
  loadPlanWorksites: (planId: number) => Promise<string[]>;
  /** the caller's queries an accept makes stale (the station graph) */
  invalidates: readonly QueryKey[];
  /** reload the station after a refused (stale) accept */
  onReload: () => void;
  /** a link to a node on the Station screen */
  nodeHref: (key: string) => string;
}

interface Run {
  request: SocketPlanRequest;
  version: number;
  targets: PlanTarget[];
  unit: LengthUnit;
}

export interface SocketPlanner {
  controls: ReactNode;
  results: ReactNode;
  overlay: ReactNode;
  /** feed the scene's surface picks here: true when picking targets consumed it */
  pickSurface: (pick: { point: Vec3 }) => boolean;
  picking: boolean;
  /** points to frame in 3D once a plan is shown: the envelopes and their targets */
  focus: Vec3[] | null;
}

const checkbox = cn('accent-accent', focusRing);

export function useSocketPlanner(
  station: SocketPlannerStation,
  pieces: SocketScenePieces,
  options: SocketPlannerOptions,
): SocketPlanner {
  const canSave = useCan('sockets:save');
  const worksites = useMemo(() => station.nodes.filter((n) => n.kind === 'worksite'), [station.nodes]);
  const sockets = useMemo(
    () => station.nodes.filter((n) => n.kind === 'socket' && n.normal),
    [station.nodes],
  );
  const nodesByKey = useMemo(() => new Map(station.nodes.map((n) => [n.key, n])), [station.nodes]);

  const [chosenWorksites, setChosenWorksites] = useState<ReadonlySet<string>>(new Set());
  const [picked, setPicked] = useState<PlanTarget[]>([]);
  const [picking, setPicking] = useState(false);
  const [pickCount, setPickCount] = useState(0);
  const [excluded, setExcluded] = useState<ReadonlySet<string>>(new Set());
  const [gridOn, setGridOn] = useState(false);
  const [gridText, setGridText] = useState('1');
  const [unit, setUnit] = useState<LengthUnit>('m');
  const [planId, setPlanId] = useState('');
  const [planNote, setPlanNote] = useState<string | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [run, setRun] = useState<Run | null>(null);
  const [accepted, setAccepted] = useState<AcceptSocketPlanResult | null>(null);

  const plan = useSocketPlan(station.id, run?.version ?? station.version, run?.request ?? null);
  const accept = useAcceptSocketPlan({ invalidates: options.invalidates, onSuccess: setAccepted });
  const views = useMemo(
    () => (plan.data && run ? plannedSocketViews(plan.data, nodesByKey, station.reach) : []),
    [plan.data, run, nodesByKey, station.reach],
  );

  /** null frames the whole plan; an index frames that socket's envelope and its targets */
  const [framed, setFramed] = useState<number | null>(null);
  const focus = useMemo(() => {
    if (!run || views.length === 0) return null;
    const shown = framed === null ? views : views.filter((v) => v.index === framed);
    const box = shown.flatMap((v) =>
      [-1, 1].flatMap((d) =>
        [0, 1, 2].map((axis) => v.workPoint.map((c, i) => (i === axis ? c + d * v.radiusM * 2 : c)) as Vec3),
      ),
    );
    return [...box, ...shown.flatMap((v) => v.targets.map((t) => run.targets[t].position))];
  }, [run, views, framed]);

  const targets: PlanTarget[] = [
    ...worksites
      .filter((w) => chosenWorksites.has(w.key))
      .map((w) => ({ label: w.key, position: w.position, nodeKey: w.key })),
    ...picked,
  ];

  const toggle = (set: ReadonlySet<string>, key: string, on: boolean) => {
    const next = new Set(set);
    if (on) next.add(key);
    else next.delete(key);
    return next;
  };

  const addPlanWorksites = async () => {
    const id = Number(planId);
    if (!id) return;
    setPlanNote(null);
    try {
      const keys = await options.loadPlanWorksites(id);
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
    setAccepted(null);
    setFramed(null);
    accept.reset();
    setRun({ request: checked.data, version: station.version, targets, unit });
  };

  const conflict = staleVersionOf(accept.error) !== null;
  const newCount = views.filter((v) => v.isNew).length;

  const controls = (
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
              <li key={w.key}>
                <label className="flex items-baseline gap-2 text-sm text-text-strong">
                  <input
                    type="checkbox"
                    className={checkbox}
                    checked={chosenWorksites.has(w.key)}
                    onChange={(e) => setChosenWorksites((s) => toggle(s, w.key, e.target.checked))}
                  />
                  <span className="font-mono font-semibold">{w.key}</span>
                  {w.label && <span className="truncate text-xs text-text-muted">{w.label}</span>}
                </label>
              </li>
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
              { value: '', label: options.plans.length ? 'Choose a plan…' : 'No plan uses this station' },
              ...options.plans.map((p) => ({ value: String(p.id), label: p.title })),
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
            variant={picking ? 'primary' : 'secondary'}
            aria-pressed={picking}
            onClick={() => setPicking((p) => !p)}
          >
            {picking ? 'Picking: click the model' : 'Pick points'}
          </Button>
        </div>
        {picked.length > 0 && (
          <ul className="space-y-1">
            {picked.map((p, i) => (
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
                  onClick={() => setPicked((ps) => ps.filter((_, j) => j !== i))}
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
            <li key={s.key}>
              <label className="flex items-center gap-2 font-mono text-xs text-text-strong">
                <input
                  type="checkbox"
                  className={checkbox}
                  checked={!excluded.has(s.key)}
                  onChange={(e) => setExcluded((x) => toggle(x, s.key, !e.target.checked))}
                />
                {s.key}
              </label>
            </li>
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
      <Button onClick={submit} isLoading={plan.isFetching} disabled={targets.length === 0}>
        Plan sockets for {targets.length} target{targets.length === 1 ? '' : 's'}
      </Button>
    </div>
  );

  const rows = plan.data && run ? assignmentRows(plan.data, run.targets, views) : [];
  const results = run && (
    <section aria-label="Socket plan" className="space-y-4">
      {plan.isPending && <Spinner label="Planning sockets" />}
      {plan.error && (
        <Alert tone="danger">{apiErrorMessage(plan.error, 'The socket plan could not be computed.')}</Alert>
      )}
      {plan.data && (
        <>
          <div className="space-y-1">
            <p className="text-base font-semibold text-text-strong">
              {views.length} socket{views.length === 1 ? '' : 's'} for {run.targets.length} target
              {run.targets.length === 1 ? '' : 's'}: {views.length - newCount} existing, {newCount} new
            </p>
            <p className="text-sm text-text-strong">{exactnessText(plan.data)}.</p>
            <p className="text-xs text-text-muted">
              Work envelope: a sphere of radius {formatLength(station.reach.radiusM, run.unit, 2)} around the
              work point {formatLength(station.reach.standOffM, run.unit, 2)} out along each socket&apos;s
              normal (station reach settings, planning defaults from memory). Computed on station version{' '}
              {run.version}.
            </p>
          </div>
          {plan.data.uncovered.length > 0 && (
            <Alert
              tone="caution"
              title={`${plan.data.uncovered.length} target${plan.data.uncovered.length === 1 ? '' : 's'} out of reach of every candidate`}
            >
              <ul className="list-disc pl-4">
                {plan.data.uncovered.map((i) => (
                  <li key={i}>
                    {run.targets[i].label}: no candidate socket brings it within reach. Add grid candidates or
                    another socket.
                  </li>
                ))}
              </ul>
            </Alert>
          )}
          <ul aria-label="Planned sockets" className="flex flex-wrap gap-2 text-sm">
            {views.map((v) => (
              <li
                key={v.index}
                className="flex items-center gap-2 rounded-md border border-surface-line py-1 pr-1 pl-2"
              >
                <span>
                  <span className="font-mono font-semibold">{v.name}</span>{' '}
                  <span className="text-xs text-text-muted">
                    {v.isNew ? 'new' : 'existing'} · serves{' '}
                    {v.targets.map((t) => run.targets[t].label).join(', ') || 'none'}
                  </span>
                </span>
                <Button
                  size="sm"
                  variant="ghost"
                  aria-pressed={framed === v.index}
                  onClick={() => setFramed(framed === v.index ? null : v.index)}
                >
                  {framed === v.index ? 'Show all' : `Show ${v.name}`}
                </Button>
              </li>
            ))}
          </ul>
          <SocketPlanTable rows={rows} unit={run.unit} />
          {canSave && newCount > 0 && !accepted && (
            <div className="flex items-center gap-3">
              <Button
                isLoading={accept.isPending}
                onClick={() =>
                  accept.mutate({
                    stationId: station.id,
                    version: run.version,
                    sockets: newSocketsToAccept(views, run.targets),
                  })
                }
              >
                Accept {newCount} new socket{newCount === 1 ? '' : 's'}
              </Button>
              <span className="text-xs text-text-muted">
                Adds them to the station model, each joined by a hop to the nearest handrail node.
              </span>
            </div>
          )}
          {canSave && newCount === 0 && (
            <p className="text-sm text-text-muted">Every chosen socket already exists: nothing to add.</p>
          )}
          {conflict && (
            <Alert tone="danger" title="The station changed since this plan was computed">
              <p>{accept.error?.message} Reload the station and plan again; nothing was saved.</p>
              <Button
                size="sm"
                variant="secondary"
                className="mt-2"
                onClick={() => {
                  setRun(null);
                  accept.reset();
                  options.onReload();
                }}
              >
                Reload the station
              </Button>
            </Alert>
          )}
          {accept.error && !conflict && (
            <Alert tone="danger">{apiErrorMessage(accept.error, 'The sockets could not be saved.')}</Alert>
          )}
          {accepted && (
            <Alert
              tone="success"
              title={`Added ${accepted.sockets.length} socket${accepted.sockets.length === 1 ? '' : 's'} (station version ${accepted.version})`}
            >
              <ul className="mt-1 space-y-0.5">
                {accepted.sockets.map((s) => (
                  <li key={s.key}>
                    <a
                      className={cn('font-mono font-semibold underline', focusRing)}
                      href={options.nodeHref(s.key)}
                    >
                      {s.key}
                    </a>{' '}
                    joined to {s.joinedTo} by a {formatLength(s.hopM, run.unit)} hop
                  </li>
                ))}
              </ul>
            </Alert>
          )}
        </>
      )}
    </section>
  );

  const overlay = (
    <>
      {picked.length > 0 && <PickedPointsOverlay points={picked} pieces={pieces} />}
      {run && views.length > 0 && <SocketPlanOverlay sockets={views} targets={run.targets} pieces={pieces} />}
    </>
  );

  return {
    focus,
    controls,
    results,
    overlay,
    picking,
    pickSurface: ({ point }) => {
      if (!picking) return false;
      setPicked((ps) => [...ps, { label: `Point ${pickCount + 1}`, position: point }]);
      setPickCount((n) => n + 1);
      return true;
    },
  };
}
