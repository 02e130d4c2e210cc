import { useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { formatElapsed } from '@shared/compute/units';
import type { WalkStep } from '@shared/compute/walkthrough';
import type { StepNote } from '@shared/compute/station-notes';
import { MAX_NOTE_LENGTH, type WalkthroughNotes } from '@shared/schemas/walkthrough';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { controlClass } from '@/components/ui/input';
import { isApiError, staleVersionOf } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { walkthroughKeys } from '../api/keys';
import { useUpdateWalkthrough } from '../api/update-walkthrough';
import { STEP_TYPE_LABELS, stepCallout, type Lane, type ListedStep } from '../lib/playback-model';
import { LANE_STYLES } from './lane-styles';
import { StepFacts } from './step-cards';
import { StationNoteLines } from './station-note-lines';

/** The step each lane has under way, for the callout and the list's highlight. */
export interface CurrentSteps {
  lanes: readonly Lane[];
  indices: readonly number[];
}

export function currentStepOf(current: CurrentSteps, laneIndex: number): WalkStep | undefined {
  return current.lanes[laneIndex]?.track.steps[current.indices[laneIndex]];
}

export function StepCallout({
  current,
  stationNotes,
}: {
  current: CurrentSteps;
  /** the station notes of each step, by step id */
  stationNotes?: ReadonlyMap<string, StepNote[]>;
}) {
  return (
    <div className="space-y-2" aria-live="polite" data-testid="step-callout">
      {current.lanes.map((lane, i) => {
        const step = currentStepOf(current, i);
        if (!step) return null;
        const style = LANE_STYLES[lane.id];
        return (
          <div
            key={lane.id}
            className="rounded-md border-l-4 bg-ink-900 px-3 py-2 text-ink-100"
            style={{ borderColor: style.color }}
          >
            <p className="text-xs font-semibold tracking-wide text-ink-300 uppercase">
              <span aria-hidden="true" style={{ color: style.color }}>
                {style.glyph}
              </span>{' '}
              {lane.label} · {STEP_TYPE_LABELS[step.type]} · {formatElapsed(step.start)}
            </p>
            <p className="mt-0.5 text-sm font-semibold text-white">{stepCallout(step)}</p>
            <p className="mt-0.5 text-xs text-ink-300">{step.detail}</p>
            <StepFacts step={step} className="mt-0.5 text-xs text-ink-100" />
            <StationNoteLines
              notes={stationNotes?.get(step.id)}
              withBody
              className="mt-1 text-xs text-white"
            />
          </div>
        );
      })}
    </div>
  );
}

function NoteEditor({
  walkthroughId,
  version,
  stepId,
  initial,
  onDone,
}: {
  walkthroughId: number;
  version: number;
  stepId: string;
  initial: string;
  onDone: () => void;
}) {
  const [text, setText] = useState(initial);
  const queryClient = useQueryClient();
  const save = useUpdateWalkthrough({ onSuccess: onDone });
  const stale = staleVersionOf(save.error) !== null;
  return (
    <form
      className="mt-2 space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate({ id: walkthroughId, data: { version, notes: { [stepId]: text } } });
      }}
    >
      <label className="block text-xs font-medium text-text-strong" htmlFor={`note-${stepId}`}>
        Trainer note
      </label>
      <textarea
        id={`note-${stepId}`}
        className={cn(controlClass, 'min-h-20 py-2')}
        value={text}
        maxLength={MAX_NOTE_LENGTH}
        onChange={(e) => setText(e.target.value)}
        autoFocus
      />
      {stale ? (
        <Alert tone="caution" title="Someone else saved this walkthrough after you opened it.">
          Your note is still here. Load their version, check the step, then save again.
          <div className="mt-2">
            <Button
              size="sm"
              variant="secondary"
              onClick={() => {
                save.reset();
                void queryClient.invalidateQueries({ queryKey: walkthroughKeys.detail(walkthroughId) });
              }}
            >
              Load the latest version
            </Button>
          </div>
        </Alert>
      ) : (
        save.error && (
          <Alert tone="danger">
            {isApiError(save.error) ? save.error.message : 'The note could not be saved.'}
          </Alert>
        )
      )}
      <div className="flex gap-2">
        <Button size="sm" type="submit" isLoading={save.isPending}>
          Save note
        </Button>
        <Button size="sm" variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
      <p className="text-xs text-text-muted">Leave it empty and save to remove the note.</p>
    </form>
  );
}

export function StepList({
  steps,
  current,
  notes,
  walkthroughId,
  version,
  canEdit,
  onSeek,
  stationNotes,
}: {
  steps: readonly ListedStep[];
  current: CurrentSteps;
  notes: WalkthroughNotes;
  /** the station notes of each step, by step id */
  stationNotes?: ReadonlyMap<string, StepNote[]>;
  walkthroughId: number;
  version: number;
  canEdit: boolean;
  onSeek: (step: ListedStep) => void;
}) {
  const [editing, setEditing] = useState<string | null>(null);
  const currentIds = new Set(current.lanes.map((_, i) => currentStepOf(current, i)?.id).filter(Boolean));
  const list = useRef<HTMLOListElement>(null);
  const firstCurrent = steps.find((s) => currentIds.has(s.step.id))?.step.id;
  useEffect(() => {
    // only the list scrolls to the current step: the page (and the 3D view) stays where it is
    const box = list.current;
    const el = box?.querySelector<HTMLElement>(`[data-step-id="${firstCurrent}"]`);
    if (!box || !el) return;
    const top = el.offsetTop;
    if (top < box.scrollTop) box.scrollTop = top;
    else if (top + el.offsetHeight > box.scrollTop + box.clientHeight)
      box.scrollTop = top + el.offsetHeight - box.clientHeight;
  }, [firstCurrent]);

  return (
    <ol
      ref={list}
      aria-label="Steps"
      className="relative h-full divide-y divide-surface-line overflow-y-auto"
    >
      {steps.map((s) => {
        const isCurrent = currentIds.has(s.step.id);
        const note = notes[s.step.id];
        const style = LANE_STYLES[s.lane];
        const lane = current.lanes.find((l) => l.id === s.lane);
        return (
          <li
            key={s.step.id}
            data-step-id={s.step.id}
            aria-current={isCurrent ? 'step' : undefined}
            className={cn('px-3 py-2', isCurrent && 'bg-accent-soft')}
          >
            <button
              type="button"
              onClick={() => onSeek(s)}
              className={cn('block w-full rounded text-left', focusRing)}
            >
              <span className="flex items-baseline gap-2 text-xs text-text-muted">
                <span className="font-mono tabular-nums">#{s.number}</span>
                <span className="font-mono text-text-strong tabular-nums">{formatElapsed(s.step.start)}</span>
                {current.lanes.length > 1 && (
                  <span className="font-semibold text-text-strong">
                    <span aria-hidden="true" style={{ color: style.color }}>
                      {style.glyph}
                    </span>{' '}
                    {lane?.short}
                  </span>
                )}
                <span>{STEP_TYPE_LABELS[s.step.type]}</span>
                {isCurrent && <span className="ml-auto font-semibold text-accent-strong">now</span>}
              </span>
              <span className="mt-0.5 block text-sm font-medium text-text-strong">{stepCallout(s.step)}</span>
              {s.step.equipment?.map((line) => (
                <span key={line} className="block text-xs text-text">
                  <span aria-hidden="true">▸ </span>
                  {line}
                </span>
              ))}
              <StationNoteLines
                notes={stationNotes?.get(s.step.id)}
                className="mt-0.5 text-xs text-text-strong"
              />
            </button>
            {note && editing !== s.step.id && (
              <p className="mt-1 rounded bg-caution-soft px-2 py-1 text-sm text-text-strong">
                <span className="font-semibold">Trainer note: </span>
                {note}
              </p>
            )}
            {canEdit &&
              (editing === s.step.id ? (
                <NoteEditor
                  walkthroughId={walkthroughId}
                  version={version}
                  stepId={s.step.id}
                  initial={note ?? ''}
                  onDone={() => setEditing(null)}
                />
              ) : (
                <Button
                  size="sm"
                  variant="ghost"
                  className="mt-1 h-7 px-2 text-xs"
                  onClick={() => setEditing(s.step.id)}
                >
                  {note ? 'Edit note' : 'Add note'}
                  <span className="sr-only"> for step {s.number}</span>
                </Button>
              ))}
          </li>
        );
      })}
    </ol>
  );
}
