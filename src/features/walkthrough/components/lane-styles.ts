import type { ManifestKind } from '@shared/schemas/plan';
import type { LaneId } from '../lib/playback-model';

/**
 * EV1 and EV2 differ by shape and glyph as well as colour, so they are told apart without colour.
 * A route walked on its own uses EV1's look.
 */
export const LANE_STYLES: Record<
  LaneId,
  { color: string; tether: string; shape: 'octahedron' | 'box'; glyph: string }
> = {
  EV1: { color: '#ff9f43', tether: '#ffd08a', shape: 'octahedron', glyph: '◆' },
  EV2: { color: '#7ee081', tether: '#c3f5c4', shape: 'box', glyph: '■' },
  crew: { color: '#ff9f43', tether: '#ffd08a', shape: 'octahedron', glyph: '◆' },
};

/**
 * Items by kind: cool colours apart from the crew's warm ones, and a shape per kind (a plate for a
 * foot restraint, a ring for a tether anchor, a larger box for a large item).
 */
export const ITEM_STYLE: { colors: Record<ManifestKind, string>; label: string } = {
  colors: {
    tool: '#6cc4ff',
    bag: '#9aa8ff',
    'foot-restraint': '#ff6fb5',
    'tether-anchor': '#ffe14d',
    'handling-aid': '#5fe0d0',
    'large-item': '#c08bff',
    other: '#b8c4d6',
  },
  label: '#e8f1ff',
};
