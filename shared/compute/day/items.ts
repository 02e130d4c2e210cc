import type { CrewMember } from '../../schemas/plan';
import type { DayItem, DayStart, EquipmentTrack, ItemState, ItemWhere } from './types';

/** The manifest value of `startsAt` that means the airlock. */
const AIRLOCK = 'airlock';

export function sameWhere(a: ItemWhere, b: ItemWhere): boolean {
  if (a.kind !== b.kind) return false;
  if (a.kind === 'carried') return a.crew === (b as { crew: CrewMember }).crew;
  if (a.kind === 'at' || a.kind === 'installed') return a.node === (b as { node: string }).node;
  return true;
}

/** `airlock` or the airlock's own key both mean the airlock. */
export function placeWhere(node: string, airlockKey: string): ItemWhere {
  return node === AIRLOCK || node === airlockKey ? { kind: 'airlock' } : { kind: 'at', node };
}

/**
 * Where an item is when the EVA clock starts: where the day's start state puts it (an earlier EVA
 * of a series left it there), else where the manifest says. An item in the airlock with a crew
 * member to carry it out is in their hands at egress.
 */
export function initialWhere(item: DayItem, airlockKey: string, carried?: ItemWhere): ItemWhere {
  if (carried === undefined && item.installedAt !== undefined)
    return { kind: 'installed', node: item.installedAt };
  const start = carried ?? placeWhere(item.startsAt ?? AIRLOCK, airlockKey);
  if (start.kind === 'airlock' && item.carriedBy) return { kind: 'carried', crew: item.carriedBy };
  return start;
}

export function describeWhere(where: ItemWhere): string {
  switch (where.kind) {
    case 'airlock':
      return 'in the airlock';
    case 'carried':
      return `held by ${where.crew}`;
    case 'at':
      return `at ${where.node}`;
    case 'installed':
      return `installed at ${where.node}`;
  }
}

interface Entry {
  item: DayItem;
  where: ItemWhere;
  states: ItemState[];
}

/**
 * Every item in exactly one place at every instant. Changes arrive in time order (the day is
 * simulated in time order); each closes the item's current state and opens the next, so the states
 * tile the day. A change at the very instant a state opened replaces it rather than leaving a
 * zero-length state.
 */
export class ItemLedger {
  private readonly entries = new Map<string, Entry>();

  constructor(items: readonly DayItem[], airlockKey: string, startWhere: DayStart['items'] = {}) {
    for (const item of items) {
      const where = initialWhere(item, airlockKey, startWhere[item.key]);
      this.entries.set(item.key, { item, where, states: [{ start: 0, end: 0, where }] });
    }
  }

  /** A copy whose changes leave this ledger as it is. */
  copy(): ItemLedger {
    const out = new ItemLedger([], '');
    for (const [k, e] of this.entries) {
      out.entries.set(k, { item: e.item, where: e.where, states: e.states.map((s) => ({ ...s })) });
    }
    return out;
  }

  has(key: string): boolean {
    return this.entries.has(key);
  }

  item(key: string): DayItem | undefined {
    return this.entries.get(key)?.item;
  }

  where(key: string): ItemWhere | undefined {
    return this.entries.get(key)?.where;
  }

  keys(): string[] {
    return [...this.entries.keys()];
  }

  move(key: string, t: number, where: ItemWhere): void {
    const e = this.entries.get(key);
    if (!e || sameWhere(e.where, where)) return;
    const last = e.states[e.states.length - 1];
    if (t < last.start) throw new Error(`internal: item ${key} moved back in time (${t} < ${last.start})`);
    if (t === last.start) {
      e.states.pop();
      const before = e.states[e.states.length - 1];
      if (before && sameWhere(before.where, where)) {
        e.where = where;
        return;
      }
    } else last.end = t;
    e.states.push({ start: t, end: t, where });
    e.where = where;
  }

  /** Items held by a crew member now. */
  heldBy(crew: CrewMember): DayItem[] {
    const out: DayItem[] = [];
    for (const e of this.entries.values()) {
      if (e.where.kind === 'carried' && e.where.crew === crew) out.push(e.item);
    }
    return out;
  }

  /** Items installed at a node now, of one kind. */
  installedAt(node: string, kind: DayItem['kind']): DayItem[] {
    const out: DayItem[] = [];
    for (const e of this.entries.values()) {
      if (e.item.kind === kind && e.where.kind === 'installed' && e.where.node === node) out.push(e.item);
    }
    return out;
  }

  /** Nodes where a portable tether anchor is installed now: attach points for every route. */
  anchorNodes(): string[] {
    const out = new Set<string>();
    for (const e of this.entries.values()) {
      if (e.item.kind === 'tether-anchor' && e.where.kind === 'installed') out.add(e.where.node);
    }
    return [...out].sort();
  }

  /** Closes every item's last state at the day's end. */
  tracks(endSeconds: number): EquipmentTrack[] {
    return [...this.entries.values()].map((e) => {
      const states = e.states.map((s) => ({ ...s }));
      states[states.length - 1].end = endSeconds;
      return { item: e.item.key, name: e.item.name, kind: e.item.kind, states };
    });
  }
}
