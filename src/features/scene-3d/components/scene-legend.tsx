import type { ReactNode } from 'react';
import { NODE_KINDS, type NodeKind } from '@shared/schemas/station';
import { EDGE_PATTERNS, type EdgeLayerId } from '../builders/edges';
import { GLYPH_INSTANCE_BUDGET, GLYPH_SHAPES } from '../builders/glyphs';
import { EDGE_COLORS, HAZARD_COLORS, NODE_COLORS } from '../builders/scene-colors';

const NODE_NAMES: Record<NodeKind, string> = {
  airlock: 'Airlock',
  junction: 'Junction',
  anchor: 'Anchor (tether point)',
  socket: 'Foot-restraint socket',
  worksite: 'Worksite',
};

function Glyph({ kind }: { kind: NodeKind }) {
  const c = NODE_COLORS[kind];
  const shapes: Record<NodeKind, ReactNode> = {
    airlock: <circle cx="10" cy="10" r="6.5" fill="none" stroke={c} strokeWidth="3" />,
    anchor: <path d="M10 3 L16 10 L10 17 L4 10 Z" fill={c} />,
    junction: <rect x="7.5" y="7.5" width="5" height="5" fill={c} />,
    socket: <path d="M10 3 L15.5 16 L4.5 16 Z" fill={c} />,
    worksite: <path d="M8.5 3h3v5.5H17v3h-5.5V17h-3v-5.5H3v-3h5.5z" fill={c} />,
  };
  return (
    <svg viewBox="0 0 20 20" className="size-5 shrink-0 rounded bg-ink-950" aria-hidden="true">
      {shapes[kind]}
    </svg>
  );
}

function LinePattern({ id }: { id: EdgeLayerId }) {
  const p = EDGE_PATTERNS[id];
  const dash = p.dash ? `${Math.max(2, p.dash * 12)} ${Math.max(2, (p.gap ?? 0) * 14)}` : undefined;
  return (
    <svg viewBox="0 0 28 10" className="h-5 w-7 shrink-0 rounded bg-ink-950" aria-hidden="true">
      <line x1="2" y1="5" x2="26" y2="5" stroke={EDGE_COLORS[id]} strokeWidth="2.5" strokeDasharray={dash} />
    </svg>
  );
}

const EDGE_NAMES: Record<EdgeLayerId, string> = {
  handrail: 'Handrail',
  hop: 'Hop',
  ride: 'Arm ride',
  closed: 'Closed edge',
};

function Item({ icon, name, detail }: { icon: ReactNode; name: string; detail: string }) {
  return (
    <li className="flex items-center gap-2">
      {icon}
      <span>
        <span className="font-medium text-text-strong">{name}</span>
        <span className="text-text-muted"> — {detail}</span>
      </span>
    </li>
  );
}

export function SceneLegend() {
  return (
    <div className="grid gap-3 text-xs sm:grid-cols-3" aria-label="Legend">
      <ul className="space-y-1.5" aria-label="Node glyphs">
        {NODE_KINDS.map((kind) => (
          <Item key={kind} icon={<Glyph kind={kind} />} name={NODE_NAMES[kind]} detail={GLYPH_SHAPES[kind]} />
        ))}
        <li className="pt-1 text-text-muted">
          Past {GLYPH_INSTANCE_BUDGET.toLocaleString('en')} nodes the most numerous kinds are drawn as dots of
          their colour.
        </li>
      </ul>
      <ul className="space-y-1.5" aria-label="Edge lines">
        {(Object.keys(EDGE_NAMES) as EdgeLayerId[]).map((id) => (
          <Item
            key={id}
            icon={<LinePattern id={id} />}
            name={EDGE_NAMES[id]}
            detail={EDGE_PATTERNS[id].description}
          />
        ))}
      </ul>
      <ul className="space-y-1.5" aria-label="Hazards and axes">
        <Item
          icon={
            <span
              className="size-5 shrink-0 rounded border-2 border-dashed"
              style={{ borderColor: HAZARD_COLORS['keep-out'], background: `${HAZARD_COLORS['keep-out']}55` }}
            />
          }
          name="Keep-out"
          detail="volume with a wire cage; no route enters"
        />
        <Item
          icon={
            <span className="size-5 shrink-0 rounded" style={{ background: `${HAZARD_COLORS.caution}55` }} />
          }
          name="Caution"
          detail="plain volume; routes through it are warned"
        />
        <li className="pt-1 text-text-muted">
          Axes: <b className="text-text-strong">S</b> +x starboard, <b className="text-text-strong">F</b> +y
          fore, <b className="text-text-strong">Z</b> +z zenith. Drag to orbit, right-drag to pan, scroll to
          zoom.
        </li>
      </ul>
    </div>
  );
}
