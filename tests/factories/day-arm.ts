import type { StationDocument, StationDocumentInput } from '@shared/schemas/station';
import { LINE_KEYS as K, lineStationDocument } from './day';

/**
 * The line station with an arm at A2 (16, 0, 0): reach 1–20 m, tip 0.1 m/s, 30 s settle; and a
 * worksite WX at (8, 6, 8), off every handrail, 10 m from A1 and √164 ≈ 12.8 m from the arm's base.
 */
export const ARM_1 = {
  key: 'ARM-1',
  baseNode: K.a2,
  reachM: 20,
  minReachM: 1,
  tipSpeedMps: 0.1,
  settleSeconds: 30,
};

export function armLineDocument(over: Partial<StationDocumentInput> = {}): StationDocument {
  const base = lineStationDocument();
  return lineStationDocument({
    nodes: [...base.nodes, { key: 'WX', kind: 'worksite', position: [8, 6, 8] }],
    arms: [ARM_1],
    ...over,
  });
}

/** The foot restraint installed on ARM-1's end, left outside at the end of the day. */
export const restraintOnArm = {
  key: 'afr',
  name: 'Arm foot restraint',
  kind: 'foot-restraint' as const,
  installedAt: 'ARM-1',
  leaveOutside: true,
};
