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
