import type { RefObject } from 'react';
import { NODE_KINDS } from '@shared/schemas/station';
import { Button, focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { PRESET_LABELS, PRESET_VIEWS } from '../builders/frame';
import type { LayerId, SceneLayers } from '../builders/station-objects';
import type { SceneApi } from './scene-api';

export const LAYER_LABELS: Record<LayerId, string> = {
  truss: 'Truss',
  handrails: 'Handrails',
  airlock: 'Airlocks',
  junction: 'Junctions',
  anchor: 'Anchors',
  socket: 'Sockets',
  worksite: 'Worksites',
  arms: 'Arms',
  armReach: 'Arm reach',
  hazards: 'Hazards',
  labels: 'Labels',
  annotations: 'Annotations',
};

const LAYER_GROUPS: [string, readonly LayerId[]][] = [
  ['Structure', ['truss', 'handrails']],
  ['Nodes', NODE_KINDS],
  ['Arms', ['arms', 'armReach']],
  ['Overlays', ['hazards', 'labels', 'annotations']],
];

function LayerToggle({ id, on, onToggle }: { id: LayerId; on: boolean; onToggle: () => void }) {
  return (
    <button
      type="button"
      aria-pressed={on}
      onClick={onToggle}
      className={cn(
        'inline-flex h-8 items-center gap-1.5 rounded-md border px-2.5 text-sm font-medium',
        focusRing,
        on
          ? 'border-accent bg-accent-soft text-accent-strong'
          : 'border-surface-line bg-surface-panel text-text-muted line-through decoration-1',
      )}
    >
      <span aria-hidden="true" className="w-3 text-center">
        {on ? '✓' : '–'}
      </span>
      {LAYER_LABELS[id]}
    </button>
  );
}

export function SceneToolbar({
  api,
  layers,
  onLayersChange,
}: {
  api: RefObject<SceneApi | null>;
  layers: SceneLayers;
  onLayersChange: (layers: SceneLayers) => void;
}) {
  return (
    <div className="space-y-2" role="toolbar" aria-label="3D view controls">
      <div className="flex flex-wrap items-center gap-1.5">
        <span className="mr-1 text-xs font-semibold tracking-wide text-text-muted uppercase">View from</span>
        {PRESET_VIEWS.map((view) => (
          <Button key={view} size="sm" variant="secondary" onClick={() => api.current?.setPresetView(view)}>
            {PRESET_LABELS[view]}
          </Button>
        ))}
        <Button size="sm" variant="secondary" onClick={() => api.current?.setPresetView('home')}>
          Oblique
        </Button>
        <Button size="sm" onClick={() => api.current?.fitToView()}>
          Fit to view
        </Button>
      </div>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1.5">
        {LAYER_GROUPS.map(([group, ids]) => (
          <div
            key={group}
            role="group"
            aria-label={`${group} layers`}
            className="flex flex-wrap items-center gap-1.5"
          >
            <span className="mr-1 text-xs font-semibold tracking-wide text-text-muted uppercase">
              {group}
            </span>
            {ids.map((id) => (
              <LayerToggle
                key={id}
                id={id}
                on={layers[id]}
                onToggle={() => onLayersChange({ ...layers, [id]: !layers[id] })}
              />
            ))}
          </div>
        ))}
      </div>
    </div>
  );
}
