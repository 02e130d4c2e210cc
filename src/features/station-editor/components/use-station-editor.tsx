import type { ReactNode } from 'react';
import { useCan } from '@/lib/authorization';
import type { EditableGraph, SurfacePick } from '../utils/types';
import { EditPanel } from './edit-panel';

/** What the Station screen tells its panels (its own context fits this). */
export interface EditorScreenContext {
  graph: EditableGraph;
  selection: { type: string; key: string } | null;
  select: (selection: { type: 'node'; key: string } | null) => void;
  lastSurfacePick: SurfacePick | null;
}

/**
 * The Edit tab for those who may edit the station model, else null (the server checks every edit
 * anyway). `onChanged` refetches the station graph after a saved edit or a reload.
 */
export function useStationEditor(onChanged: () => void): {
  id: string;
  label: string;
  render: (ctx: EditorScreenContext) => ReactNode;
} | null {
  const canEdit = useCan('stations:edit');
  if (!canEdit) return null;
  return {
    id: 'edit',
    label: 'Edit',
    render: (ctx) => (
      <EditPanel
        graph={ctx.graph}
        selectedKey={ctx.selection?.type === 'node' ? ctx.selection.key : null}
        onSelectNode={(key) => ctx.select(key ? { type: 'node', key } : null)}
        pick={ctx.lastSurfacePick}
        onChanged={onChanged}
      />
    ),
  };
}
