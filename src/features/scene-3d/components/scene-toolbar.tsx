import { useEffect, useId, useRef, useState, type ReactNode, type RefObject } from 'react';
import { NODE_KINDS } from '@shared/schemas/station';
import { Button, focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { PRESET_LABELS, PRESET_VIEWS } from '../builders/frame';
import type { LayerId, SceneLayers } from '../builders/station-objects';
import type { SceneApi } from './scene-api';
import { SceneLegend } from './scene-legend';

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

/**
 * The layer toggles and the legend in one panel that opens from the toolbar (and closes with Escape
 * or a click elsewhere), so they take none of the 3D view's height while nobody needs them.
 */
function LayersMenu({
  layers,
  onLayersChange,
}: {
  layers: SceneLayers;
  onLayersChange: (layers: SceneLayers) => void;
}) {
  const [open, setOpen] = useState(false);
  const id = useId();
  const root = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (!open) return;
    const away = (e: PointerEvent) => {
      if (!root.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener('pointerdown', away);
    return () => document.removeEventListener('pointerdown', away);
  }, [open]);
  const ids = Object.keys(LAYER_LABELS) as LayerId[];
  const shown = ids.filter((l) => layers[l]).length;
  return (
    <div
      ref={root}
      className="relative"
      onKeyDown={(e) => {
        if (e.key === 'Escape' && open) {
          e.stopPropagation();
          setOpen(false);
          button.current?.focus();
        }
      }}
    >
      <Button
        ref={button}
        size="sm"
        variant="secondary"
        aria-expanded={open}
        aria-controls={id}
        onClick={() => setOpen(!open)}
      >
        Layers{' '}
        <span className="text-text-muted">
          {shown}/{ids.length}
        </span>{' '}
        <span aria-hidden="true">▾</span>
      </Button>
      {open && (
        <div
          id={id}
          role="dialog"
          aria-label="Layers and legend"
          className="absolute top-full right-0 z-20 mt-1 w-[min(44rem,calc(100vw-2rem))] space-y-3 rounded-lg border border-surface-line bg-surface-panel p-3 shadow-lg"
        >
          <div className="flex flex-wrap items-center gap-x-4 gap-y-1.5">
            {LAYER_GROUPS.map(([group, groupIds]) => (
              <div
                key={group}
                role="group"
                aria-label={`${group} layers`}
                className="flex flex-wrap items-center gap-1.5"
              >
                <span className="mr-1 text-xs font-semibold tracking-wide text-text-muted uppercase">
                  {group}
                </span>
                {groupIds.map((layer) => (
                  <LayerToggle
                    key={layer}
                    id={layer}
                    on={layers[layer]}
                    onToggle={() => onLayersChange({ ...layers, [layer]: !layers[layer] })}
                  />
                ))}
              </div>
            ))}
          </div>
          <SceneLegend />
        </div>
      )}
    </div>
  );
}

/** One row over the 3D view: viewpoints, framing, the layers menu and whatever the screen adds. */
export function SceneToolbar({
  api,
  layers,
  onLayersChange,
  onFrameSelection,
  children,
}: {
  api: RefObject<SceneApi | null>;
  layers?: SceneLayers;
  onLayersChange?: (layers: SceneLayers) => void;
  /** frames what is selected; the button shows only when something is */
  onFrameSelection?: () => void;
  /** the screen's own controls, at the row's end */
  children?: ReactNode;
}) {
  return (
    <div className="flex flex-wrap items-center gap-1.5" role="toolbar" aria-label="3D view controls">
      <span className="mr-1 hidden text-xs font-semibold tracking-wide text-text-muted uppercase xl:inline">
        View from
      </span>
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
      {onFrameSelection && (
        <Button size="sm" variant="secondary" onClick={onFrameSelection}>
          Frame selection
        </Button>
      )}
      <div className="ml-auto flex flex-wrap items-center gap-1.5">
        {children}
        {layers && onLayersChange && <LayersMenu layers={layers} onLayersChange={onLayersChange} />}
      </div>
    </div>
  );
}
