import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ChangeEvent } from '@shared/schemas/events';
import type { FlownEstimate } from '@shared/compute/day/flown-estimates';
import { staleKeysOf } from '@/app/live-keys';
import { LiveUpdates } from '@/features/live/live-updates';
import { useFlownEstimates } from '@/features/plans/api/get-flown-estimates';
import { TaskForm } from '@/features/plans/components/task-form';
import { PlanEditor } from '@/features/plans/components/plan-editor';
import { getPlanQueryOptions } from '@/features/plans/api/get-plan';
import { usePlanTimeline } from '@/features/plans/api/get-plan-timeline';
import { planKeys } from '@/features/plans/api/keys';
import type { PlanView } from '@/features/plans/types';
import { createQueryClient } from '@/lib/query-client';
import { toWire } from '@shared/compute/day/wire';
import { LINE_KEYS } from '../factories/day';
import { buildParsedTask } from '../factories/plan';
import { buildPlanTimeline, buildPlanView } from '../factories/plan-view';
import { renderInDataRouter, renderWithQueryClient } from '../setup/client';

/** Stands in for the server's `GET /api/events` stream: the test says what arrives on it. */
class StreamStandIn extends EventTarget {
  static open: StreamStandIn[] = [];
  constructor(readonly url: string) {
    super();
    StreamStandIn.open.push(this);
  }
  close() {
    StreamStandIn.open = StreamStandIn.open.filter((s) => s !== this);
  }
  static send(event: string, data: unknown) {
    for (const s of StreamStandIn.open)
      s.dispatchEvent(new MessageEvent(event, { data: JSON.stringify(data) }));
  }
}

/** Stands in for the API: each path answers what `answers` holds for it now; `asked` counts the requests. */
function fakeApi(answers: Record<string, () => unknown>) {
  const asked: Record<string, number> = {};
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      const path = url.replace(/^\/api/, '');
      asked[path] = (asked[path] ?? 0) + 1;
      const answer = answers[path];
      if (!answer) return Response.json({ error: { code: 'NOT_FOUND', message: path } }, { status: 404 });
      return Response.json(answer());
    }),
  );
  return asked;
}

beforeEach(() => {
  StreamStandIn.open = [];
  vi.stubGlobal('EventSource', StreamStandIn);
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const STATION = 7;
const task = buildParsedTask({ title: 'Swap the pump', worksite: 'W1', durationSeconds: 1800 });

/** The task form as the plan editor feeds it: the station's flown estimates from the query cache. */
function TaskFormWithEstimates() {
  const flown = useFlownEstimates(STATION);
  return (
    <TaskForm
      task={task}
      others={[]}
      nodes={{
        worksites: [{ key: 'W1', label: 'Pump bay', kind: 'worksite', position: [0, 0, 0] }],
        sockets: [],
      }}
      manifest={[]}
      onSubmit={() => {}}
      onCancel={() => {}}
      flownEstimates={flown.data}
    />
  );
}

describe('the live stream keeps what is on screen current', () => {
  it("refreshes the task form's flown estimates when a run is logged, without polling", async () => {
    let estimates: FlownEstimate[] = [];
    const asked = fakeApi({ [`/stations/${STATION}/flown-estimates`]: () => estimates });
    renderWithQueryClient(
      <LiveUpdates staleKeysOf={staleKeysOf}>
        <TaskFormWithEstimates />
      </LiveUpdates>,
    );
    await waitFor(() => expect(asked[`/stations/${STATION}/flown-estimates`]).toBe(1));
    expect(screen.queryByTestId('flown-estimate')).toBeNull();

    // a run on the station ends: its logged lengths are now an estimate
    estimates = [
      {
        title: 'Swap the pump',
        worksite: 'W1',
        flights: 1,
        seconds: 2460,
        minSeconds: 2460,
        maxSeconds: 2460,
      },
    ];
    StreamStandIn.send('change', { kind: 'run', id: 3, version: 9 } satisfies ChangeEvent);
    await waitFor(() =>
      expect(screen.getByTestId('flown-estimate').textContent).toMatch(/Flown here: 41 min/),
    );
    expect(asked[`/stations/${STATION}/flown-estimates`]).toBe(2);
  });
});

/**
 * Stands in for the plan API on a loaded server: each request reads the plan as it arrives, and
 * those that came before `answerAll` are answered then, in the order they came.
 */
function slowPlanServer(plan: PlanView) {
  let current = plan;
  let holding = true;
  const held: (() => void)[] = [];
  const asked = { plan: 0, timeline: 0 };
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      const read = current;
      const timeline = url.endsWith('/timeline');
      asked[timeline ? 'timeline' : 'plan']++;
      if (holding) await new Promise<void>((release) => held.push(release));
      return Response.json(timeline ? toWire(buildPlanTimeline(read)) : read);
    }),
  );
  return {
    asked,
    /** someone saves the plan: later requests read this */
    save: (next: PlanView) => (current = next),
    answerAll: () => {
      holding = false;
      for (const release of held.splice(0)) release();
    },
  };
}

const dayTasks = [buildParsedTask({ title: 'Inspect hinge', worksite: LINE_KEYS.w3, durationSeconds: 2700 })];
const added = buildParsedTask({
  title: 'Route cable',
  worksite: LINE_KEYS.w1,
  crew: 'EV2',
  durationSeconds: 3600,
});

function DayVersion({ planId }: { planId: number }) {
  const day = usePlanTimeline(planId);
  if (!day.data) return <p>Computing</p>;
  return (
    <p>
      Day of version {day.data.planVersion}, {day.data.crew.EV2.blocks.length} EV2 blocks
    </p>
  );
}

describe('a change while a first load is on its way', () => {
  it("shows the plan's day with a task added before the day's first answer came", async () => {
    const before = buildPlanView(dayTasks);
    const after = buildPlanView([...dayTasks, added], { version: before.version + 1 });
    const blocks = (plan: PlanView) => buildPlanTimeline(plan).crew.EV2.blocks.length;
    expect(blocks(after)).toBeGreaterThan(blocks(before));
    const server = slowPlanServer(before);
    renderWithQueryClient(
      <LiveUpdates staleKeysOf={staleKeysOf}>
        <DayVersion planId={before.id} />
      </LiveUpdates>,
    );
    await waitFor(() => expect(server.asked.timeline).toBe(1));
    // the day on its way was read before the save, so it cannot stand for the change
    server.save(after);
    StreamStandIn.send('change', {
      kind: 'plan',
      id: before.id,
      version: after.version,
    } satisfies ChangeEvent);
    server.answerAll();
    await screen.findByText(`Day of version ${after.version}, ${blocks(after)} EV2 blocks`);
    expect(server.asked.timeline).toBe(2);
  });

  it('gives a route loader waiting on a first load the plan as saved after it was asked', async () => {
    const before = buildPlanView(dayTasks);
    const server = slowPlanServer(before);
    const queryClient = createQueryClient();
    const loaded = queryClient.ensureQueryData(getPlanQueryOptions(before.id));
    await waitFor(() => expect(server.asked.plan).toBe(1));
    server.save({ ...before, title: 'Renamed', version: before.version + 1 });
    void queryClient.invalidateQueries({ queryKey: planKeys.detail(before.id) });
    server.answerAll();
    expect(await loaded).toMatchObject({ title: 'Renamed', version: before.version + 1 });
    expect(server.asked.plan).toBe(2);
  });
});

describe('a recomputation that fails', () => {
  it('says the day shown is the last one computed, and computes it again when asked', async () => {
    const plan = buildPlanView(dayTasks);
    let failing = false;
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string) => {
        if (url === `/api/plans/${plan.id}/timeline`)
          return failing
            ? Response.json(
                { error: { code: 'UNAVAILABLE', message: 'Every route worker is busy; try again shortly.' } },
                { status: 503 },
              )
            : Response.json(toWire(buildPlanTimeline(plan)));
        if (url === `/api/stations/${plan.stationId}/flown-estimates`) return Response.json([]);
        return Response.json({ error: { code: 'NOT_FOUND', message: url } }, { status: 404 });
      }),
    );
    const { queryClient } = renderInDataRouter(
      <PlanEditor
        plan={plan}
        user={{ id: 1, email: 'planner@example.org', name: 'Priya', role: 'planner' }}
        rehearseHref="/walkthroughs"
      />,
    );
    await screen.findByText(`Computed for version ${plan.version}`);
    // the server is overloaded when the day is asked again (a 5xx is retried twice, then it shows)
    failing = true;
    void queryClient.invalidateQueries({ queryKey: planKeys.timeline(plan.id) });
    const alert = await screen.findByRole('alert', {}, { timeout: 8000 });
    expect(alert.textContent).toMatch(/computed for version 3: it could not be recomputed/);
    expect(alert.textContent).toMatch(/Every route worker is busy/);
    failing = false;
    await userEvent.setup().click(screen.getByRole('button', { name: 'Compute again' }));
    await waitFor(() => expect(screen.queryByText(/could not be recomputed/)).toBeNull());
    expect(screen.getByText(`Computed for version ${plan.version}`)).toBeTruthy();
  }, 15_000);
});
