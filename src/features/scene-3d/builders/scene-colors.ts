import type { EdgeKind, HazardKind, NodeKind } from '@shared/schemas/station';
import { palette } from '../../../../tailwind.config';

/**
 * Colours of the 3D scene on the ink background. Every kind also has its own shape or line
 * pattern (glyphs.ts, edges.ts), so no kind is told apart by colour alone.
 */
export const SCENE_COLORS = {
  background: palette.ink[950],
  truss: '#7f8ea8',
  trussSurface: '#8fa3c2',
  module: '#c9d3e3',
  selection: '#ffffff',
  hover: palette.accent.bright,
} as const;

export const NODE_COLORS: Record<NodeKind, string> = {
  airlock: '#f2f5fa',
  junction: '#8fa3c2',
  anchor: palette.accent.bright,
  socket: '#f5b849',
  worksite: '#e879a6',
};

export const EDGE_COLORS: Record<EdgeKind | 'closed', string> = {
  handrail: '#e8d06a',
  hop: '#9fd3ff',
  ride: '#c7a6ff',
  closed: '#ff6b6b',
};

export const HAZARD_COLORS: Record<HazardKind, string> = {
  'keep-out': '#ff4d4f',
  caution: '#ffb020',
};
