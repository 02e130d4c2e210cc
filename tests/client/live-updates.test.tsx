import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, screen, waitFor } from '@testing-library/react';
import type { ChangeEvent } from '@shared/schemas/events';
import type { FlownEstimate } from '@shared/compute/day/flown-estimates';
import { staleKeysOf } from '@/app/live-keys';
import { LiveUpdates } from '@/features/live/live-updates';
import { useFlownEstimates } from '@/features/plans/api/get-flown-estimates';
import { TaskForm } from '@/features/plans/components/task-form';
import { buildParsedTask } from '../factories/plan';
import { renderWithQueryClient } from '../setup/client';

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
