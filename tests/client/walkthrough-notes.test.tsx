import { act } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { WalkStep } from '@shared/compute/walkthrough';
import { staleVersionDetails } from '@shared/errors';
import { StepList } from '@/features/walkthrough/components/step-list';
import type { Lane, ListedStep } from '@/features/walkthrough/lib/playback-model';
import { render, until } from './render';

const step = (n: number, start: number): WalkStep => ({
  id: `r-${n}`,
  type: n === 2 ? 'swap' : 'translate',
  start,
  end: start + 60,
  title: `Step ${n}`,
  detail: 'detail',
  nodeKey: `N-${n}`,
  clipKey: n === 2 ? 'N-2' : undefined,
  releaseKey: n === 2 ? 'N-1' : undefined,
  paidOutM: 0,
  anchorKey: 'N-1',
});
const steps = [step(1, 0), step(2, 60), step(3, 120)];
const lane: Lane = {
  id: 'crew',
  label: 'Crew member',
  short: 'Crew',
  tetherLengthM: 10,
  track: { steps, pieces: [], endSeconds: 180 },
};
const listed: ListedStep[] = steps.map((s, i) => ({ step: s, lane: 'crew', number: i + 1 }));
const current = { lanes: [lane], indices: [1] };

afterEach(() => vi.unstubAllGlobals());

function click(el: Element | null | undefined) {
  if (!el) throw new Error('no element to click');
  act(() => (el as HTMLElement).click());
}
const button = (root: HTMLElement, name: RegExp) =>
  [...root.querySelectorAll('button')].find((b) => name.test(b.textContent ?? ''));

describe('trainer notes in the step list', () => {
  it('keeps the draft and says what happened when someone else saved first (409)', async () => {
    const fetch = vi.fn(
      async () =>
        new Response(
          JSON.stringify({
            error: {
              code: 'CONFLICT',
              message: 'The walkthrough was changed since you loaded it',
              details: staleVersionDetails(3, { currentVersion: 4, changedBy: null, changedAt: null }),
            },
          }),
          {
            status: 409,
            headers: { 'Content-Type': 'application/json' },
          },
        ),
    );
    vi.stubGlobal('fetch', fetch);
    const view = await render(
      <StepList
        steps={listed}
        current={current}
        notes={{}}
        walkthroughId={7}
        version={3}
        canEdit
        onSeek={() => {}}
      />,
    );
    expect(view.container.querySelector('[aria-current="step"]')?.getAttribute('data-step-id')).toBe('r-2');
    click(
      view.container.querySelector('[data-step-id="r-2"]') &&
        button(view.container.querySelector('[data-step-id="r-2"]')!, /Add note/),
    );
    const textarea = view.container.querySelector('textarea')!;
    await act(async () => {
      const setter = Object.getOwnPropertyDescriptor(HTMLTextAreaElement.prototype, 'value')?.set;
      setter?.call(textarea, 'Check the gate is locked');
      textarea.dispatchEvent(new Event('input', { bubbles: true }));
    });
    click(button(view.container, /Save note/));
    await until(() => view.container.textContent?.includes('Someone else saved this walkthrough'));
    const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/walkthroughs/7');
    expect(JSON.parse(init.body as string)).toEqual({
      version: 3,
      notes: { 'r-2': 'Check the gate is locked' },
    });
    expect(view.container.querySelector('textarea')!.value).toBe('Check the gate is locked');
    expect(button(view.container, /Load the latest version/)).toBeTruthy();
    view.unmount();
  });

  it('shows notes read-only to people who cannot edit walkthroughs', async () => {
    const view = await render(
      <StepList
        steps={listed}
        current={current}
        notes={{ 'r-3': 'Slow down here' }}
        walkthroughId={7}
        version={3}
        canEdit={false}
        onSeek={() => {}}
      />,
    );
    expect(view.container.textContent).toContain('Trainer note: Slow down here');
    expect(button(view.container, /note/i)).toBeUndefined();
    view.unmount();
  });
});
