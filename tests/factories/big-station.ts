import { generateTrussStation } from '@shared/compute/truss-generator';
import type { StationDocument } from '@shared/schemas/station';

export interface BigStationOptions {
  /** nodes in all, sockets included */
  nodes?: number;
  /** foot-restraint sockets added on the truss's top face, keyed `XS-00001`… */
  sockets?: number;
  seed?: number;
}

/** The added platform: 100 m × 1,000 m, its top face at z = LONG_PLATFORM_TOP (nothing else near it). */
export const LONG_PLATFORM_TOP = -48.5;
export const LONG_PLATFORM_CENTRE_X = -200;

/**
 * A large generated truss with many sockets and one long thin platform: the station the heaviest
 * valid requests are made on. The sockets sit on the truss's top face along its whole length, so
 * every one of them reaches a target above it.
 */
export function bigStation({ nodes = 100_000, sockets = 20_000, seed = 5 }: BigStationOptions = {}) {
  const doc: StationDocument = generateTrussStation({ nodes: nodes - sockets, seed });
  const top = Math.max(...doc.segments.map((s) => s.center[2] + s.size[2] / 2));
  const length = Math.max(...doc.segments.map((s) => s.center[0] + s.size[0] / 2));
  const socketKeys: string[] = [];
  for (let i = 0; i < sockets; i++) {
    const key = `XS-${String(i + 1).padStart(5, '0')}`;
    socketKeys.push(key);
    doc.nodes.push({
      key,
      kind: 'socket',
      position: [((i + 0.5) * length) / sockets, ((i % 7) - 3) * 0.9, top],
      normal: [0, 0, 1],
    });
  }
  doc.segments.push({
    key: 'LONG',
    label: 'Long platform',
    kind: 'platform',
    center: [LONG_PLATFORM_CENTRE_X, 0, LONG_PLATFORM_TOP - 1.5],
    size: [100, 1000, 3],
  });
  doc.name = `Big station (${doc.nodes.length} nodes)`;
  return { doc, socketKeys, length, top };
}
