import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, renderHook, waitFor } from '@testing-library/react';
import type { ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { staleVersionDetails } from '@shared/errors';
import { createQueryClient } from '@/lib/query-client';
import { AUTOSAVE_IDLE_MS, usePlanDraft } from '@/features/plans/lib/use-plan-draft';
import type { PlanView } from '@/features/plans/types';
import { buildPlanView } from '../factories/plan-view';

const planView = () => buildPlanView();

interface Patch {
  body: Record<string, unknown> & { version: number };
  keepalive: boolean;
}

/** Stands in for the plan API: PATCH against anything but the current version is a 409, as the server's. */
function fakePlanApi(plan: PlanView, { answerAfterMs = 0 } = {}) {
  const patches: Patch[] = [];
  let current = plan;
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init: RequestInit = {}) => {
      if ((init.method ?? 'GET') === 'GET') return Response.json(current);
      const body = JSON.parse(String(init.body)) as Patch['body'];
      patches.push({ body, keepalive: init.keepalive === true });
      await new Promise((r) => setTimeout(r, answerAfterMs));
      if (body.version !== current.version) {
        return Response.json(
          {
            error: {
              code: 'CONFLICT',
              message: 'The plan was changed since you loaded it.',
              details: staleVersionDetails(body.version, {
                currentVersion: current.version,
                changedBy: 'Lars',
                changedAt: '2026-01-01T10:00:00.000Z',
              }),
            },
          },
          { status: 409 },
        );
      }
      const { version: _v, ...fields } = body;
      current = { ...current, ...fields, version: current.version + 1 } as PlanView;
      return Response.json(current);
    }),
  );
  return {
    patches,
    current: () => current,
    /** someone else saves the plan */
    bump: () => (current = { ...current, version: current.version + 1 }),
  };
}

function renderDraft(plan: PlanView) {
  const client = createQueryClient();
  const wrapper = ({ children }: { children: ReactNode }) => (
    <QueryClientProvider client={client}>{children}</QueryClientProvider>
  );
  return renderHook(() => usePlanDraft(plan, true), { wrapper });
}

const pause = (ms: number) => act(() => new Promise<void>((r) => setTimeout(r, ms)));

afterEach(() => vi.unstubAllGlobals());

describe('autosave groups an editing burst into one save', () => {
  it('edits with short pauses between them (a title typed, a crew name changed) make one PATCH and one new version', async () => {
    const plan = planView();
    const api = fakePlanApi(plan);
    const { result } = renderDraft(plan);
    const title = 'Pump swap, day two';
    // keystrokes 60 ms apart, and a person's pauses of 800 ms to think: one burst of work
    for (let k = 1; k <= title.length; k += 2) {
      act(() => result.current.change({ title: title.slice(0, k) }));
      await pause(k % 6 === 1 ? 800 : 60);
    }
    act(() => result.current.change({ title }));
    act(() => result.current.change({ crew: { ...plan.crew, EV2: { ...plan.crew.EV2, name: 'Lars V.' } } }));
    expect(result.current.state).toBe('unsaved');
    // a pause shorter than a burst's end sends nothing yet
    await pause(AUTOSAVE_IDLE_MS / 2);
    expect(api.patches).toHaveLength(0);

    await waitFor(() => expect(result.current.state).toBe('saved'), { timeout: AUTOSAVE_IDLE_MS * 3 });
    expect(api.patches).toHaveLength(1);
    expect(api.patches[0].body).toMatchObject({ version: 3, title });
    expect(api.current()).toMatchObject({ version: 4, title });
    expect(api.current().crew.EV2.name).toBe('Lars V.');
    expect(result.current.savedVersion).toBe(4);
  });

  it('an edit made while a save is on its way is saved after it, from the new version (never a 409 on itself)', async () => {
    const plan = planView();
    const api = fakePlanApi(plan, { answerAfterMs: 300 });
    const { result } = renderDraft(plan);
    act(() => result.current.change({ title: 'First burst' }));
    act(() => {
      expect(result.current.save()).toBe(true);
    });
    await waitFor(() => expect(result.current.state).toBe('saving'));
    act(() => result.current.change({ date: '2026-03-02' }));
    await waitFor(() => expect(result.current.state).toBe('saved'), { timeout: AUTOSAVE_IDLE_MS * 3 });
    expect(api.patches.map((p) => p.body.version)).toEqual([3, 4]);
    expect(api.current()).toMatchObject({ version: 5, title: 'First burst', date: '2026-03-02' });
  });

  it('keep() sends what is not saved at once as a request that outlives the page, and only once', async () => {
    const plan = planView();
    const api = fakePlanApi(plan, { answerAfterMs: 200 });
    const { result } = renderDraft(plan);
    act(() => result.current.change({ title: 'Left right after typing' }));
    let kept: boolean[] = [];
    act(() => {
      kept = [result.current.keep(), result.current.keep()];
    });
    expect(kept).toEqual([true, false]);
    await waitFor(() => expect(result.current.state).toBe('saved'));
    expect(api.patches).toHaveLength(1);
    expect(api.patches[0].keepalive).toBe(true);
    expect(api.current().title).toBe('Left right after typing');
    // nothing left to send: leaving asks nothing and sends nothing
    act(() => {
      expect(result.current.keep()).toBe(false);
    });
    expect(api.patches).toHaveLength(1);
  });

  it('a burst saved over someone else’s save is still refused: the draft reports the conflict and stops', async () => {
    const plan = planView();
    const api = fakePlanApi(plan);
    const { result } = renderDraft(plan);
    api.bump();
    act(() => result.current.change({ title: 'Mine' }));
    await waitFor(() => expect(result.current.state).toBe('conflict'), { timeout: AUTOSAVE_IDLE_MS * 3 });
    expect(api.patches).toHaveLength(1);
    expect(api.current().title).toBe('Test EVA');
    await pause(AUTOSAVE_IDLE_MS + 200);
    expect(api.patches).toHaveLength(1);
  });
});
