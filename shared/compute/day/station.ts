import type { StationDocument, Vec3 } from '../../schemas/station';
import { nearestAttachM } from '../attach-distance';
import type { CompiledStation } from '../compiled-station';
import { excludeMaskFor } from '../routes';
import type { DayNode, DayStation } from './types';

/** The day's view of a station: nodes by key, the airlock, sockets, settings and attach distances. */
export function dayStationOf(doc: StationDocument, compiled: CompiledStation): DayStation | null {
  const airlock = doc.nodes.find((n) => n.kind === 'airlock');
  if (!airlock) return null;
  const byKey = new Map<string, DayNode>();
  const sockets: { key: string; position: Vec3; normal: Vec3 }[] = [];
  for (const n of doc.nodes) {
    byKey.set(n.key, { kind: n.kind, position: n.position, ...(n.normal ? { normal: n.normal } : {}) });
    if (n.kind === 'socket' && n.normal) sockets.push({ key: n.key, position: n.position, normal: n.normal });
  }
  const arms = doc.arms.flatMap((a) => {
    const base = byKey.get(a.baseNode);
    return base ? [{ ...a, base: base.position }] : [];
  });
  return {
    airlockKey: airlock.key,
    arms,
    keepOut: doc.hazards.filter((h) => h.kind === 'keep-out'),
    orbit: doc.orbit,
    settings: doc.settings,
    node: (key) => byKey.get(key),
    sockets,
    nearestAttachM(node, extraAttach, allowRide) {
      const s = compiled.keyToIndex.get(node);
      if (s === undefined) return null;
      const extra = new Set<number>();
      for (const key of extraAttach) {
        const v = compiled.keyToIndex.get(key);
        if (v !== undefined) extra.add(v);
      }
      return nearestAttachM(compiled, s, excludeMaskFor(allowRide), extra);
    },
  };
}
