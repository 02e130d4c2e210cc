import { useMemo, useState, type ComponentType, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { User } from '@shared/schemas/auth';
import type { OrbitSettings } from '@shared/schemas/station';
import { can } from '@shared/auth/permissions';
import { Alert } from '@/components/ui/alert';
import { focusRing } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { FormError } from '@/components/ui/form-error';
import { LeaveGuard } from '@/components/leave-guard';
import { UnsavedEditsProvider, useUnsavedEdits } from '@/components/unsaved-edits';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { PageSpinner } from '@/components/ui/spinner';
import { apiErrorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { planExportHref } from '../api/export-plan';
import { usePlanTimeline } from '../api/get-plan-timeline';
import { useFlownEstimates } from '../api/get-flown-estimates';
import { usePlanDraft } from '../lib/use-plan-draft';
import { FieldValidityContext, useFieldValidity } from '../lib/field-validity';
import { planOrbitArcs } from '../lib/form-fields';
import type { DayFocus, DayViewProps, PlanStationNodes, PlanView } from '../types';
import { ConflictNotice } from './conflict-notice';
import { CrewEditor, SettingsEditor } from './crew-and-settings';
import { ManifestEditor, itemRowId } from './manifest-editor';
import { OrderSuggestion } from './order-suggestion';
import { orbitStartWords } from './orbit-start-field';
import { PlanStatusBadge } from './plan-status-badge';
import { ReviewPanel } from './review-panel';
import { PlanActions } from './plan-actions';
import { SaveIndicator } from './save-indicator';
import { StationNotesPanel } from './station-notes-panel';
import { taskRowId } from './task-row';
import { TasksEditor } from './tasks-editor';
import { TimelineChart } from './timeline-chart';
import { TimelineTotals } from './timeline-totals';
import { WarningsPanel, warningCountsByTask, type WarningTarget } from './warnings-panel';

const TIMELINE_ID = 'plan-timeline';

const LOCKED: Record<string, string> = {
  'in-review':
    'This plan is in review, so it is locked. A reviewer approves it or returns it to draft; the author can withdraw it.',
  approved: 'This plan is approved, so it is locked. A planner must return it to draft before it can change.',
};

const linkClass = cn(
  'inline-flex h-8 items-center gap-1.5 rounded-md border border-surface-line bg-surface-panel px-3 text-sm font-medium text-text-strong hover:bg-surface-sunken',
  focusRing,
);

function goTo(target: WarningTarget) {
  const id =
    target.kind === 'task'
      ? taskRowId(target.index)
      : target.kind === 'item'
        ? itemRowId(target.index)
        : TIMELINE_ID;
  const el = document.getElementById(id);
  el?.scrollIntoView({ block: 'center', behavior: 'smooth' });
  el?.focus({ preventScroll: true });
}

interface PlanEditorProps {
  plan: PlanView;
  user: User;
  /** the station's worksites and sockets; undefined while they load */
  nodes?: PlanStationNodes;
  /** the station's orbit, to read the start against sunrise and sunset; undefined while it loads */
  orbit?: OrbitSettings;
  /** the walkthrough screen for this plan, composed by the route */
  rehearseHref: string;
  /** an optional picker the route composes beside the task list, e.g. a small 3D view */
  extra?: ReactNode;
  /** a line the route composes beside the title, e.g. who else has the plan open */
  beside?: ReactNode;
  /** what the route composes at the top of the side column, e.g. an approved plan's runs */
  aside?: ReactNode;
  /** the day in 3D under the chart: a block picked on the chart is gone to and framed there */
  DayView?: ComponentType<DayViewProps>;
}

export function PlanEditor({
  plan,
  user,
  nodes,
  orbit,
  rehearseHref,
  extra,
  beside,
  aside,
  DayView,
}: PlanEditorProps) {
  const [focus, setFocus] = useState<DayFocus | null>(null);
  const [cursor, setCursor] = useState<number>();
  const editable = can(user, 'plans:edit') && plan.status === 'draft';
  const readOnly = !editable;
  const fields = useFieldValidity();
  // a form on the page (a task, an item) holding edits not applied: those no save can keep
  const forms = useUnsavedEdits();
  const { draft, change, save, keep, reload, conflict, state, error, savedVersion, invalidCount } =
    usePlanDraft(plan, editable, fields.count);
  const [deleted, setDeleted] = useState(false);
  const timeline = usePlanTimeline(plan.id);
  const flownEstimates = useFlownEstimates(plan.stationId);
  const tl = timeline.data;
  const places = nodes?.worksites.map((n) => n.key) ?? [];
  const unsaved = state !== 'saved';
  const beta = draft.betaDegOverride;
  const arcs = useMemo(() => (orbit ? planOrbitArcs(orbit, beta) : undefined), [orbit, beta]);

  return (
    <FieldValidityContext.Provider value={fields.report}>
      <UnsavedEditsProvider value={forms.report}>
        <div className="space-y-4 pb-6">
          <LeaveGuard
            when={editable && (unsaved || forms.count > 0) && !deleted}
            keep={forms.count > 0 ? undefined : keep}
            busy={state === 'saving'}
            reason={
              forms.count > 0
                ? 'A form on this page holds edits not applied yet (a task or an item); leaving drops them.'
                : state === 'invalid'
                  ? `${invalidCount || 'Some'} field${invalidCount === 1 ? ' holds' : 's hold'} text that is not saved until it is fixed; leaving drops it.`
                  : state === 'conflict'
                    ? 'The plan was changed elsewhere; your edits here are not saved.'
                    : 'Some edits are not saved yet; leaving now drops them.'
            }
          />
          <header className="sticky top-0 z-20 -mx-3 space-y-0.5 border-b border-surface-line bg-surface-page/95 px-3 py-2 backdrop-blur sm:-mx-4 sm:px-4">
            <div className="flex flex-wrap items-center gap-x-3 gap-y-2">
              <h1 className="text-xl font-semibold tracking-tight text-text-strong">
                {draft.title || plan.title}
              </h1>
              <PlanStatusBadge status={plan.status} />
              {editable && (
                <SaveIndicator
                  state={state}
                  version={savedVersion}
                  invalidCount={invalidCount}
                  onSave={() => save()}
                />
              )}
              <div className="ml-auto flex flex-wrap items-center gap-2">
                <a className={linkClass} href={planExportHref(plan.id, 'csv')} download>
                  ⤓ Timeline CSV
                </a>
                <a className={linkClass} href={planExportHref(plan.id, 'pdf')} download>
                  ⤓ Cue cards (PDF)
                </a>
                <Link className={linkClass} to={rehearseHref}>
                  ▶ Rehearse
                </Link>
                <PlanActions plan={plan} user={user} onDeleted={() => setDeleted(true)} />
              </div>
            </div>
            <div className="flex flex-wrap items-center gap-x-4 gap-y-0.5 text-sm text-text-muted">
              <p>
                {plan.stationName} · EVA {draft.date}
                {arcs && <> · {orbitStartWords(draft.orbitPhaseAtStartDeg, arcs)}</>} · version {plan.version}{' '}
                · written by {plan.authorName ?? 'someone no longer here'}
                {plan.approverName && <> · approved by {plan.approverName}</>}
              </p>
              {beside}
            </div>
          </header>

          {LOCKED[plan.status] && (
            <Alert tone="info" compact>
              <span className="font-semibold">Editing is locked.</span> {LOCKED[plan.status]}
            </Alert>
          )}
          {!can(user, 'plans:edit') && plan.status === 'draft' && (
            <Alert tone="info" compact>
              Your role reads plans; planners edit them.
            </Alert>
          )}
          {conflict && <ConflictNotice conflict={conflict} onReload={reload} />}
          {!conflict && <FormError error={error} fallback="The plan could not be saved." />}

          <Panel
            title="Timeline"
            dense
            actions={
              tl && (
                <span className="text-xs text-text-muted">
                  {timeline.isFetching ? 'Recomputing…' : `Computed for version ${tl.planVersion}`}
                  {unsaved && editable && !timeline.isFetching ? ' · recomputes when saved' : ''}
                </span>
              )
            }
          >
            <div id={TIMELINE_ID} tabIndex={-1} className="space-y-3 outline-none">
              <PlanningCaution compact />
              {tl && timeline.isError && !timeline.isFetching && (
                // the day on screen is the last one computed: say so, never keep it silently
                <Alert
                  tone="danger"
                  title={`Showing the day as computed for version ${tl.planVersion}: it could not be recomputed`}
                >
                  {apiErrorMessage(timeline.error, 'The server did not answer.')}{' '}
                  <button type="button" className={linkClass} onClick={() => void timeline.refetch()}>
                    Compute again
                  </button>
                </Alert>
              )}
              {tl ? (
                <TimelineChart
                  timeline={tl}
                  tasks={plan.tasks}
                  startGmt={plan.startGmt}
                  {...(DayView
                    ? {
                        cursor,
                        onPick: ({ crew, block }) => setFocus({ crew, start: block.start, end: block.end }),
                      }
                    : {})}
                />
              ) : timeline.error ? (
                <FormError error={timeline.error} fallback="The timeline could not be computed." />
              ) : (
                <PageSpinner />
              )}
            </div>
          </Panel>

          {/* wide: the tasks beside the day in 3D and the side panels, the plan's other fields under the
              tasks; narrow: one column in this order (the DOM's), the tasks right under the chart */}
          <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)] xl:grid-rows-[auto_1fr]">
            <Panel
              title={`Tasks (${draft.tasks.length})`}
              dense
              className="min-w-0 xl:col-start-1 xl:row-start-1"
            >
              {extra}
              {nodes ? (
                <TasksEditor
                  tasks={draft.tasks}
                  onChange={(tasks, added) =>
                    change(added?.length ? { tasks, manifest: [...draft.manifest, ...added] } : { tasks })
                  }
                  readOnly={readOnly}
                  nodes={nodes}
                  manifest={draft.manifest}
                  flownEstimates={flownEstimates.data}
                  reach={tl && tl.planVersion === savedVersion ? tl.reach : []}
                  warningCounts={warningCountsByTask(tl && tl.planVersion === savedVersion ? tl : undefined)}
                />
              ) : (
                <PageSpinner />
              )}
            </Panel>
            <div className="min-w-0 space-y-4 xl:col-start-2 xl:row-span-2 xl:row-start-1">
              {aside}
              {tl && (
                <Panel title="The day" dense>
                  <TimelineTotals
                    timeline={tl}
                    names={{ EV1: plan.crew.EV1.name, EV2: plan.crew.EV2.name }}
                    startGmt={plan.startGmt}
                  />
                </Panel>
              )}
              <Panel title={`Warnings${tl ? ` (${tl.warnings.length})` : ''}`} dense>
                {tl ? (
                  <WarningsPanel
                    timeline={tl}
                    itemKeys={plan.manifest.map((m) => m.key ?? '')}
                    onGoTo={goTo}
                  />
                ) : (
                  <PageSpinner />
                )}
              </Panel>
              {tl && DayView && (
                <Panel title="The day in 3D" dense>
                  <DayView timeline={tl} plan={plan} focus={focus} onTime={setCursor} />
                </Panel>
              )}
              <Panel title="Order of the day" dense>
                <OrderSuggestion
                  planId={plan.id}
                  tasks={draft.tasks}
                  canApply={editable}
                  unsaved={editable && unsaved}
                  onApply={(tasks) => change({ tasks })}
                />
              </Panel>
              <Panel title={`Station notes${tl ? ` (${tl.stationNotes?.length ?? 0})` : ''}`} dense>
                {tl ? (
                  <StationNotesPanel
                    notes={tl.stationNotes ?? []}
                    stationId={plan.stationId}
                    onGoTo={(f) => {
                      setFocus(f);
                      goTo({ kind: 'timeline' });
                    }}
                  />
                ) : (
                  <PageSpinner />
                )}
              </Panel>
              <Panel title="Review" dense>
                <ReviewPanel
                  plan={plan}
                  user={user}
                  unsaved={editable && unsaved}
                  unsavedText={
                    state === 'invalid'
                      ? `Fix the ${invalidCount === 1 ? 'marked field' : `${invalidCount || ''} marked fields`} before submitting: ${invalidCount === 1 ? 'it is' : 'they are'} not saved.`
                      : undefined
                  }
                />
              </Panel>
            </div>
            <div className="min-w-0 space-y-4 xl:col-start-1 xl:row-start-2">
              <Panel title={`Manifest (${draft.manifest.length})`} dense>
                <ManifestEditor
                  manifest={draft.manifest}
                  onChange={(manifest) => change({ manifest })}
                  readOnly={readOnly}
                  places={places}
                />
              </Panel>
              <Panel title="Crew" dense>
                <CrewEditor draft={draft} onChange={change} readOnly={readOnly} />
              </Panel>
              <Panel title="EVA settings" dense>
                <SettingsEditor draft={draft} onChange={change} readOnly={readOnly} arcs={arcs} />
              </Panel>
            </div>
          </div>
        </div>
      </UnsavedEditsProvider>
    </FieldValidityContext.Provider>
  );
}
