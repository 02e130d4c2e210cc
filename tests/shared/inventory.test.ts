import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkInventory, type InventoryItem, type InventoryTask } from '@shared/compute/inventory';

const NODES = new Set(['AL-1', 'PB3-W1', 'PB3-STOW', 'SB2-W4']);
const station = { airlockKey: 'AL-1', hasNode: (k: string) => NODES.has(k) };

const tasks: InventoryTask[] = [
  { title: 'Remove pump module', crew: 'EV1', tools: ['Pistol grip tool', 'Tether hook'] },
  { title: 'Install camera boom', crew: 'both', tools: ['torque  WRENCH'] },
];
const clean: InventoryItem[] = [
  { name: 'Pistol grip tool', kind: 'tool', carriedBy: 'EV1', startsAt: 'airlock', endsAt: 'airlock' },
  { name: 'Tether hook', kind: 'tool', carriedBy: 'EV1', endsAt: 'AL-1' },
  { name: 'Torque wrench', kind: 'tool', carriedBy: 'EV2', endsAt: 'PB3-STOW' },
  { name: 'Crew bag', kind: 'bag', carriedBy: 'EV2', startsAt: 'PB3-STOW', endsAt: 'airlock' },
];
const codes = (items: InventoryItem[], t = tasks) =>
  checkInventory(items, t, station).map((w) => [w.code, w.item ?? w.taskIndex]);

describe('checkInventory', () => {
  it('a manifest where everything comes back or is stowed at a node gives no warnings', () => {
    expect(checkInventory(clean, tasks, station)).toEqual([]);
  });

  it('missing-end: an item with no end location', () => {
    const items = clean.map((i) => (i.name === 'Crew bag' ? { ...i, endsAt: undefined } : i));
    expect(codes(items)).toEqual([['missing-end', 'Crew bag']]);
  });

  it('unknown-end and unknown-start: a location that is neither the airlock nor a node', () => {
    const items = [
      ...clean,
      {
        name: 'Spare bag',
        kind: 'bag' as const,
        carriedBy: 'EV1' as const,
        startsAt: 'PB9-X',
        endsAt: 'PB9-Y',
      },
    ];
    const w = checkInventory(items, tasks, station);
    expect(w.map((x) => x.code)).toEqual(['unknown-end', 'unknown-start']);
    expect(w[0].message).toContain('PB9-Y');
    expect(w[1].message).toContain('PB9-X');
  });

  it('without a station only the airlock literal and present locations are required', () => {
    expect(checkInventory(clean, tasks)).toEqual([]);
  });

  it('tool-not-in-manifest: a task uses a tool nobody takes out', () => {
    const t = [...tasks, { title: 'Inspect radiator', crew: 'EV2' as const, tools: ['Inspection mirror'] }];
    const w = checkInventory(clean, t, station);
    expect(w.map((x) => [x.code, x.taskIndex])).toEqual([['tool-not-in-manifest', 2]]);
    expect(w[0].message).toContain('Inspection mirror');
  });

  it('carrier-not-on-task: a tool carried by a crew member who does none of the tasks using it', () => {
    const items = clean.map((i) => (i.name === 'Tether hook' ? { ...i, carriedBy: 'EV2' as const } : i));
    expect(codes(items)).toEqual([['carrier-not-on-task', 'Tether hook']]);
  });

  it('a both task counts for either carrier; each copy of a tool is judged on its own', () => {
    const both = [
      ...clean,
      { name: 'Pistol grip tool', kind: 'tool' as const, carriedBy: 'EV2' as const, endsAt: 'airlock' },
    ];
    expect(codes(both)).toEqual([['carrier-not-on-task', 'Pistol grip tool']]);
    expect(checkInventory(both, tasks, station)[0].itemIndex).toBe(4);
  });

  it('unused-tool: a tool no task uses (bags are exempt)', () => {
    const items = [
      ...clean,
      { name: 'Spare socket', kind: 'tool' as const, carriedBy: 'EV1' as const, endsAt: 'airlock' },
    ];
    expect(codes(items)).toEqual([['unused-tool', 'Spare socket']]);
  });

  it('a manifest that takes every used tool for its users and brings it back is always clean (fast-check)', () => {
    const taskArb = fc.record({
      title: fc.constant('t'),
      crew: fc.constantFrom<'EV1' | 'EV2' | 'both'>('EV1', 'EV2', 'both'),
      tools: fc.subarray(['a', 'b', 'c', 'd', 'e']),
    });
    fc.assert(
      fc.property(
        fc.array(taskArb, { maxLength: 8 }),
        fc.constantFrom('airlock', 'AL-1', 'PB3-STOW'),
        (ts, end) => {
          const items: InventoryItem[] = [];
          for (const t of ts) {
            for (const tool of t.tools) {
              const carriedBy = t.crew === 'both' ? 'EV1' : t.crew;
              items.push({ name: tool, kind: 'tool', carriedBy, endsAt: end });
            }
          }
          expect(checkInventory(items, ts, station)).toEqual([]);
          if (items.length) {
            const dropped = items.slice(1).filter((i) => i.name !== items[0].name);
            expect(checkInventory(dropped, ts, station).some((w) => w.code === 'tool-not-in-manifest')).toBe(
              true,
            );
          }
        },
      ),
    );
  });
});
