import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import type { Vec3 } from '@shared/schemas/station';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/card';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import {
  describeStationEdit,
  previewStationEdit,
  useEditStation,
  type StationEdit,
} from '../api/edit-station';
import { AffectedPlansPrompt } from '@/components/affected-plans-prompt';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { LeaveGuard } from '@/components/leave-guard';
import { UnsavedEditsProvider, useUnsavedEdits } from '@/components/unsaved-edits';
import type { EditableGraph, SurfacePick } from '../utils/types';
import { ArmsEditor } from './arms-editor';
import { AuditList } from './audit-list';
import { ConflictNotice } from './conflict-notice';
import { ConnectForm } from './connect-form';
import { DeleteNodeButton } from './delete-node-button';
import { HazardForm } from './hazard-form';
import { KeyedRow } from './keyed-row';
import { NodeEdges } from './node-edges';
import { NodeForm } from './node-form';
import { SettingsForm } from './settings-form';

export interface EditPanelProps {
  graph: EditableGraph;
  selectedKey: string | null;
  onSelectNode: (key: string | null) => void;
  /** the latest surface click in the 3D view */
  pick: SurfacePick | null;
  /** after a saved edit or a reload: the route refetches the station graph */
  onChanged: () => void;
}

function Section({ title, open, children }: { title: string; open?: boolean; children: ReactNode }) {
  return (
    <details open={open} className="group rounded-md border border-surface-line">
      <summary className="cursor-pointer rounded-md px-3 py-2 text-sm font-semibold text-text-strong select-none hover:bg-surface-sunken focus-visible:outline-2 focus-visible:outline-accent">
        {title}
      </summary>
      <div className="space-y-3 border-t border-surface-line px-3 py-3">{children}</div>
    </details>
  );
}

type FormKind = 'node' | 'hazard' | 'arms' | 'settings';

/** The form of the edit panel whose saved change this is (edges are saved from rows, not a form). */
function formOf(edit: StationEdit): FormKind | null {
  if (edit.type === 'update-node') return 'node';
  if (edit.type.endsWith('-hazard')) return 'hazard';
  if (edit.type === 'set-arms') return 'arms';
  if (edit.type === 'update-station') return 'settings';
  return null;
}

/** The engineer's edit mode: every change carries the version it was made against. */
export function EditPanel({ graph, selectedKey, onSelectNode, pick, onChanged }: EditPanelProps) {
  const stationId = graph.station.id;
  const [savedVersion, setSavedVersion] = useState(0);
  const [saved, setSaved] = useState<string | null>(null);
  const [createdCount, setCreatedCount] = useState(0);
  // each form starts afresh after its own saved change (or a reload), never after another form's:
  // a label typed in the node form survives saving a hazard
  const [saves, setSaves] = useState<Record<FormKind, number>>({ node: 0, hazard: 0, arms: 0, settings: 0 });
  const [hazardKey, setHazardKey] = useState<string | null>(null);
  // the version the forms on screen were loaded at: a change someone else makes (seen live) does
  // not move it, so a save made against what the engineer saw is refused (409), never applied over it
  const [loadedVersion, setLoadedVersion] = useState(graph.station.version);
  const version = Math.max(loadedVersion, savedVersion);
  // the node whose form is shown: it follows the selection, but a form holding a typed change asks
  // before another node's form replaces it
  const [shownKey, setShownKey] = useState(selectedKey);
  const [nodeFormDirty, setNodeFormDirty] = useState(false);
  const shown = shownKey ? graph.nodes.find((n) => n.key === shownKey) : undefined;
  const askSwitch = selectedKey !== shownKey && nodeFormDirty && !!shown;
  if (selectedKey !== shownKey && !askSwitch) setShownKey(selectedKey);

  const mutation = useEditStation({
    stationId,
    onChanged,
    onSuccess: (result, { edit }) => {
      if (typeof result?.version === 'number') setSavedVersion(result.version);
      const kind = formOf(edit);
      if (kind) setSaves((n) => ({ ...n, [kind]: n[kind] + 1 }));
      setSaved(
        `Saved: ${describeStationEdit(edit)}${result?.version ? ` (version ${result.version})` : ''}.`,
      );
      if (edit.type === 'create-node') {
        setCreatedCount((c) => c + 1);
        onSelectNode(edit.node.key);
      }
      if (edit.type === 'delete-node') {
        // the node is gone: its form has nothing left to keep
        setNodeFormDirty(false);
        onSelectNode(null);
      }
      if (edit.type.endsWith('-hazard')) setHazardKey(null);
    },
  });
  // a change that touches plans in review or approved is put to the engineer first (a dry run)
  const [asking, setAsking] = useState<{ edit: StationEdit; plans: AffectedPlan[] } | null>(null);
  const [checking, setChecking] = useState(false);
  const ask = async (edit: StationEdit) => {
    setSaved(null);
    setAsking(null);
    setChecking(true);
    try {
      const preview = await previewStationEdit(stationId, { version, edit });
      if (preview.affectedPlans.length) return setAsking({ edit, plans: preview.affectedPlans });
    } catch {
      // a refusal (stale version, bad input) shows when the change itself is sent
    } finally {
      setChecking(false);
    }
    mutation.mutate({ version, edit });
  };
  const submit = (edit: StationEdit) => void ask(edit);
  const isSaving = mutation.isPending || checking;
  const failedEdit = mutation.isError ? mutation.variables?.edit : undefined;
  // the outcome shows above the sections; the Save button that caused it may be far below
  const status = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (!failedEdit && !saved && !asking) return;
    status.current?.scrollIntoView?.({ block: 'nearest' });
    status.current?.focus({ preventScroll: true });
  }, [failedEdit, saved, asking]);
  const around: Vec3 = shown?.position ?? [0, 0, 0];
  const editingHazard = graph.hazards.find((h) => h.key === hazardKey);
  const nodeKeys = useMemo(() => new Set(graph.nodes.map((n) => n.key)), [graph.nodes]);
  // a form holding what the engineer typed and did not save: leaving asks first
  const forms = useUnsavedEdits();

  return (
    <UnsavedEditsProvider value={forms.report}>
      <div className="space-y-3" aria-label="Edit the station model">
        <LeaveGuard
          when={forms.count > 0}
          reason={`${forms.count === 1 ? 'A form holds' : `${forms.count} forms hold`} edits to the model not saved yet; leaving drops them.`}
        />
        <p className="text-xs text-text-muted">
          Editing version {version}. A change made against an older version is refused, never merged.
        </p>
        <div ref={status} tabIndex={-1} className="space-y-2 scroll-mt-4 focus:outline-none">
          {failedEdit && (
            <ConflictNotice
              error={mutation.error}
              stationId={stationId}
              what={describeStationEdit(failedEdit)}
              onReload={() => {
                mutation.reset();
                setLoadedVersion(graph.station.version);
                onChanged();
              }}
              onReapply={(current) => mutation.mutate({ version: current, edit: failedEdit })}
            />
          )}
          {asking && (
            <AffectedPlansPrompt
              what={describeStationEdit(asking.edit)}
              plans={asking.plans}
              isSaving={isSaving}
              onCancel={() => setAsking(null)}
              onConfirm={() => {
                setAsking(null);
                mutation.mutate({ version, edit: asking.edit });
              }}
            />
          )}
          {saved && !mutation.isError && <Alert tone="success">{saved}</Alert>}
        </div>

        <Section title={shown ? `Selected node ${shown.key}` : 'Selected node'} open>
          {shown ? (
            <>
              <NodeForm
                key={`${shown.key}@${loadedVersion}.${saves.node}`}
                graph={graph}
                node={shown}
                isSaving={isSaving}
                onSubmit={submit}
                onDirtyChange={setNodeFormDirty}
              />
              <h4 className="text-sm font-semibold text-text-strong">Edges</h4>
              <NodeEdges nodeKey={shown.key} edges={graph.edges} isSaving={isSaving} onSubmit={submit} />
              <DeleteNodeButton
                nodeKey={shown.key}
                edges={graph.edges}
                isSaving={isSaving}
                onConfirm={() => submit({ type: 'delete-node', key: shown.key })}
              />
            </>
          ) : (
            <EmptyState>
              Select a node in the 3D view or the node list to move, change, connect or delete it.
            </EmptyState>
          )}
        </Section>

        <ConfirmDialog
          open={askSwitch}
          title={`Drop the edits to node ${shownKey}?`}
          confirmLabel="Drop the edits"
          cancelLabel="Keep editing"
          onCancel={() => onSelectNode(shownKey)}
          onConfirm={() => {
            setNodeFormDirty(false);
            setShownKey(selectedKey);
          }}
        >
          <p>
            The changes to node {shownKey} are not saved yet;{' '}
            {selectedKey ? `showing node ${selectedKey}` : 'clearing the selection'} drops them.
          </p>
        </ConfirmDialog>

        <Section title="Add node">
          <NodeForm
            key={createdCount}
            graph={graph}
            selectedKey={selectedKey}
            pick={pick}
            isSaving={isSaving}
            onSubmit={submit}
          />
        </Section>

        <Section title="Connect nodes">
          <ConnectForm graph={graph} selectedKey={selectedKey} isSaving={isSaving} onSubmit={submit} />
        </Section>

        <Section title={`Hazards (${graph.hazards.length})`}>
          <ul className="divide-y divide-surface-line text-sm" aria-label="Hazards">
            {graph.hazards.map((h) => (
              <KeyedRow
                key={h.key}
                noun="hazard"
                itemKey={h.key}
                removeWord="Delete"
                isSaving={isSaving}
                onChange={() => setHazardKey(h.key)}
                onRemove={() => submit({ type: 'delete-hazard', key: h.key })}
              >
                <Badge tone={h.kind === 'keep-out' ? 'danger' : 'caution'}>{h.kind}</Badge>
                <span className="text-xs text-text-muted">{h.shape}</span>
              </KeyedRow>
            ))}
          </ul>
          <h4 className="text-sm font-semibold text-text-strong">
            {editingHazard ? `Change ${editingHazard.key}` : 'Add a hazard'}
          </h4>
          <HazardForm
            key={`${hazardKey ?? 'new'}@${loadedVersion}.${saves.hazard}`}
            hazard={editingHazard}
            existingKeys={graph.hazards.map((h) => h.key)}
            around={around}
            isSaving={isSaving}
            onSubmit={submit}
            onCancel={editingHazard ? () => setHazardKey(null) : undefined}
          />
        </Section>

        <Section title={`Arms (${graph.arms.length})`}>
          <ArmsEditor
            arms={graph.arms}
            isNode={(key) => nodeKeys.has(key)}
            selectedKey={selectedKey}
            formKey={`${loadedVersion}.${saves.arms}`}
            isSaving={isSaving}
            onSubmit={submit}
          />
        </Section>

        <Section title="Station settings and orbit">
          <SettingsForm
            key={`${loadedVersion}.${saves.settings}`}
            station={graph.station}
            isSaving={isSaving}
            onSubmit={submit}
          />
        </Section>

        <Section title="Recent edits" open>
          <AuditList stationId={stationId} />
        </Section>
      </div>
    </UnsavedEditsProvider>
  );
}
