import { afterEach, describe, expect, it, vi } from 'vitest';
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { WalkStep } from '@shared/compute/walkthrough';
import { staleVersionDetails } from '@shared/errors';
import { StepList } from '@/features/walkthrough/components/step-list';
import type { Lane, ListedStep } from '@/features/walkthrough/lib/playback-model';
import { renderWithQueryClient } from '../setup/client';

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
    const user = userEvent.setup();
    const { container } = renderWithQueryClient(
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
    const currentStep = container.querySelector<HTMLElement>('[aria-current="step"]')!;
    expect(currentStep.getAttribute('data-step-id')).toBe('r-2');
    await user.click(within(currentStep).getByRole('button', { name: /Add note/ }));
    await user.type(screen.getByRole('textbox'), 'Check the gate is locked');
    await user.click(screen.getByRole('button', { name: /Save note/ }));
    await screen.findByText(/Someone else saved this walkthrough/);
    const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/walkthroughs/7');
    expect(JSON.parse(init.body as string)).toEqual({
      version: 3,
      notes: { 'r-2': 'Check the gate is locked' },
    });
    expect(screen.getByRole<HTMLTextAreaElement>('textbox').value).toBe('Check the gate is locked');
    expect(screen.getByRole('button', { name: /Load the latest version/ })).toBeTruthy();
  });

  it('shows notes read-only to people who cannot edit walkthroughs', async () => {
    const { container } = renderWithQueryClient(
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
    expect(container.textContent).toContain('Trainer note: Slow down here');
    expect(screen.queryByRole('button', { name: /note/i })).toBeNull();
  });
});
