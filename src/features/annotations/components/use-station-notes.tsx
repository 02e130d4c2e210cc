import { useMemo, useState, useSyncExternalStore, type ReactNode } from 'react';
import type { Vec3 } from '@shared/schemas/station';
import { AnnotationPins } from './annotation-pins';
import { AnnotationsPanel } from './annotations-panel';

export const NOTES_PANEL_ID = 'annotations';

/** What the Station screen tells its panels and overlays (its own context fits this). */
export interface NotesScreenContext {
  selection: { type: string; key: string } | null;
  lastSurfacePick: { point: Vec3; segmentKey?: string } | null;
  /** brings a right-panel tab to the front */
  showPanel?: (id: string) => void;
}

function createOpenNoteStore() {
  let openId: number | null = null;
  const listeners = new Set<() => void>();
  return {
    get: () => openId,
    set: (id: number | null) => {
      openId = id;
      listeners.forEach((l) => l());
    },
    subscribe: (listener: () => void) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

export interface StationNotes {
  tab: { id: string; label: string; render: (ctx: NotesScreenContext) => ReactNode };
  /** the 3D pins, a component of stable identity so the canvas keeps its meshes across renders */
  Overlays: (ctx: NotesScreenContext) => ReactNode;
}

/**
 * The Annotations tab and its 3D pins, sharing which note is open: a click on a pin opens its
 * thread in the tab.
 */
export function useStationNotes(stationId: number): StationNotes {
  const [store] = useState(createOpenNoteStore);
  const openId = useSyncExternalStore(store.subscribe, store.get);
  const Overlays = useMemo(
    () =>
      function AnnotationOverlays({ showPanel }: NotesScreenContext) {
        const open = useSyncExternalStore(store.subscribe, store.get);
        return (
          <AnnotationPins
            stationId={stationId}
            openId={open}
            onOpen={(id) => {
              store.set(id);
              showPanel?.(NOTES_PANEL_ID);
            }}
          />
        );
      },
    [store, stationId],
  );
  return {
    tab: {
      id: NOTES_PANEL_ID,
      label: 'Annotations',
      render: (ctx) => (
        <AnnotationsPanel
          stationId={stationId}
          selectedNodeKey={ctx.selection?.type === 'node' ? ctx.selection.key : null}
          pick={ctx.lastSurfacePick}
          openId={openId}
          onOpen={store.set}
        />
      ),
    },
    Overlays,
  };
}
