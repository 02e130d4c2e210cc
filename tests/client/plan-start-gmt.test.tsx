import { describe, expect, it } from 'vitest';
import { useState } from 'react';
import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { CreatePlanInputSchema } from '@shared/schemas/plan';
import { planSettingsOf } from '@shared/schemas/plan';
import { SettingsEditor } from '@/features/plans/components/crew-and-settings';
import { draftChanges, type PlanDraft } from '@/features/plans/lib/plan-draft';

function baseDraft(): PlanDraft {
  const input = CreatePlanInputSchema.parse({
    title: 'Test EVA',
    stationId: 1,
    date: '2026-03-01',
    crew: { EV1: { name: 'Ada', tetherLengthM: 25.9 }, EV2: { name: 'Lars', tetherLengthM: 16.8 } },
  });
  return {
    title: input.title,
    date: input.date,
    crew: input.crew,
    ...planSettingsOf(input),
    tasks: [],
    manifest: [],
  };
}

/** The settings form over a draft held as the plan editor holds it. */
function Harness({ onDraft }: { onDraft: (d: PlanDraft) => void }) {
  const [draft, setDraft] = useState(baseDraft);
  return (
    <SettingsEditor
      draft={draft}
      readOnly={false}
      onChange={(patch) =>
        setDraft((d) => {
          const next = { ...d, ...patch };
          onDraft(next);
          return next;
        })
      }
    />
  );
}

describe('the plan start time in the settings form', () => {
  it('reads hh:mm as GMT on the EVA date, moves with the date, and blank clears it', async () => {
    const user = userEvent.setup();
    let draft = baseDraft();
    render(<Harness onDraft={(d) => (draft = d)} />);
    const field = screen.getByLabelText('Start (GMT)');
    await user.type(field, '09:30');
    expect(draft.startGmt).toBe('2026-03-01T09:30:00Z');
    expect(draftChanges(baseDraft(), draft, 4)).toEqual({ startGmt: '2026-03-01T09:30:00Z', version: 4 });

    const date = screen.getByLabelText('EVA date');
    await user.clear(date);
    await user.type(date, '2026-03-02');
    expect(draft.startGmt).toBe('2026-03-02T09:30:00Z');

    await user.clear(field);
    expect(draft.startGmt).toBeNull();
  });

  it('keeps the last good value and says why while the text is not a time', async () => {
    const user = userEvent.setup();
    let draft = baseDraft();
    render(<Harness onDraft={(d) => (draft = d)} />);
    const field = screen.getByLabelText('Start (GMT)');
    await user.type(field, '07:15');
    await user.clear(field);
    await user.type(field, '27:15');
    expect(screen.getByText(/enter a GMT time as hh:mm/)).toBeTruthy();
    expect(draft.startGmt).toBeNull();
    await user.clear(field);
    await user.type(field, '2026-03-05 23:10');
    expect(draft.startGmt).toBe('2026-03-05T23:10:00Z');
  });
});
