import { describe, expect, it } from 'vitest';
import { computeSeries } from '@shared/compute/day/series';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan, Timeline } from '@shared/compute/day/types';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';
import { armLineDocument } from '../factories/day-arm';

const engine = dayEngine(lineStationDocument());
const eva = (plan: DayPlan) => ({ plan, ...engine });
const codes = (t: Timeline) => t.warnings.map((w) => w.code).sort();
const firstWhere = (t: Timeline, item: string) => t.equipment.find((e) => e.item === item)?.states[0].where;

/**
 * EVA 1 stages for EVA 2 on the line station: EV1 installs the foot restraint in S2 and sets the bag
 * down at W2; EV2 installs a portable anchor at W3. All three are marked to stay outside.
 */
const staging = (install = true) =>
  buildDayPlan({
    manifest: [
      { key: 'fr-1', name: 'Foot restraint 1', kind: 'foot-restraint', carriedBy: 'EV1', leaveOutside: true },
      { key: 'bag-1', name: 'Tool bag', kind: 'bag', carriedBy: 'EV1', leaveOutside: true },
      { key: 'anc-1', name: 'Portable anchor', kind: 'tether-anchor', carriedBy: 'EV2', leaveOutside: true },
    ],
    tasks: [
      dayTask('Stage the restraint and the bag', K.w2, 'EV1', 300, {
        actions: [
          ...(install ? [{ do: 'install' as const, item: 'fr-1', at: K.s2 }] : []),
          { do: 'set-down', item: 'bag-1' },
        ],
      }),
      dayTask('Put up the anchor', K.w3, 'EV2', 200, { actions: [{ do: 'install', item: 'anc-1' }] }),
    ],
  });

/** EVA 2 uses what EVA 1 staged: its manifest says where each item waits, and a new tool goes out. */
const using = (bagStartsAt: string = K.w2) =>
  buildDayPlan({
    manifest: [
      {
        key: 'fr-1',
        name: 'Foot restraint 1',
        kind: 'foot-restraint',
        installedAt: K.s2,
        leaveOutside: true,
      },
      { key: 'bag-1', name: 'Tool bag', kind: 'bag', startsAt: bagStartsAt },
      { key: 'anc-1', name: 'Portable anchor', kind: 'tether-anchor', installedAt: K.w3 },
      { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' },
    ],
    tasks: [
      dayTask('Work from the restraint', K.w2, 'EV1', 900, {
        socket: K.s2,
        tools: ['Power driver'],
        actions: [{ do: 'pick-up', item: 'bag-1' }],
      }),
      dayTask('Take the anchor down', K.w3, 'EV2', 200, { actions: [{ do: 'remove', item: 'anc-1' }] }),
    ],
  });

describe('a series of EVAs: each starts where the one before left its items (worked by hand)', () => {
  it('every item state carries over by key: installed restraint and anchor, a bag at a node; new items start from the manifest', () => {
    const [one, two] = computeSeries([eva(staging()), eva(using())]);
    expect(one.start).toEqual({});
    expect(codes(one.timeline)).toEqual([]);
    expect(two.start.items).toEqual({
      'fr-1': { kind: 'installed', node: K.s2 },
      'bag-1': { kind: 'at', node: K.w2 },
      'anc-1': { kind: 'installed', node: K.w3 },
    });
    expect(firstWhere(two.timeline, 'fr-1')).toEqual({ kind: 'installed', node: K.s2 });
    expect(firstWhere(two.timeline, 'anc-1')).toEqual({ kind: 'installed', node: K.w3 });
    expect(firstWhere(two.timeline, 'bag-1')).toEqual({ kind: 'at', node: K.w2 });
    expect(firstWhere(two.timeline, 'driver')).toEqual({ kind: 'carried', crew: 'EV1' });
    expect(codes(two.timeline)).toEqual([]);
    expect(two.warnings).toEqual([]);
    expect(two.foundOutside.map((o) => [o.item, o.leftBy])).toEqual([
      ['fr-1', 0],
      ['bag-1', 0],
      ['anc-1', 0],
    ]);
  });

  it('lists what stays outside between the EVAs and after the last, with the EVA that left it', () => {
    const [one, two] = computeSeries([eva(staging()), eva(using())]);
    expect(one.outsideAfter.map((o) => [o.item, o.where, o.leftBy])).toEqual([
      ['fr-1', { kind: 'installed', node: K.s2 }, 0],
      ['bag-1', { kind: 'at', node: K.w2 }, 0],
      ['anc-1', { kind: 'installed', node: K.w3 }, 0],
    ]);
    // the bag and the anchor come in with EVA 2; the restraint stays, still as EVA 1 left it
    expect(two.outsideAfter.map((o) => [o.item, o.leftBy])).toEqual([['fr-1', 0]]);
  });

  it('an item brought back in starts the next EVA in the airlock, carried out by whoever the manifest names', () => {
    const third = buildDayPlan({
      manifest: [{ key: 'bag-1', name: 'Tool bag', kind: 'bag', carriedBy: 'EV2' }],
      tasks: [dayTask('Look', K.w1, 'EV2', 60)],
    });
    const days = computeSeries([eva(staging()), eva(using()), eva(third)]);
    expect(days[2].start.items).toEqual({ 'bag-1': { kind: 'airlock' } });
    expect(firstWhere(days[2].timeline, 'bag-1')).toEqual({ kind: 'carried', crew: 'EV2' });
    expect(days[2].warnings).toEqual([]);
  });

  it('changing an earlier EVA re-checks the later ones: what the change brings about is listed as carried over', () => {
    const [, two] = computeSeries([eva(staging(false)), eva(using())]);
    // alone, EVA 2 finds its restraint installed as its manifest says; after EVA 1 no longer installs it, not
    expect(codes(computeTimeline(using(), engine.station, engine.route))).toEqual([]);
    expect(two.warnings.map((w) => [w.code, w.item ?? null])).toEqual([
      ['start-differs', 'fr-1'],
      ['restraint-missing', null],
    ]);
    expect(two.warnings.every((w) => w.carriedOver)).toBe(true);
    expect(two.warnings[0].message).toContain('EVA 1 leaves it in the airlock');
  });

  it('a manifest that expects an item elsewhere than the EVA before left it is told so, and the day uses where it is', () => {
    const [, two] = computeSeries([eva(staging()), eva(using(K.w1))]);
    expect(two.warnings.map((w) => w.code)).toEqual(['start-differs']);
    expect(two.warnings[0].message).toContain('at W1');
    expect(firstWhere(two.timeline, 'bag-1')).toEqual({ kind: 'at', node: K.w2 });
  });
});

describe('a series with an arm: the foot restraint left on its end starts the next EVA there', () => {
  const armEngine = dayEngine(armLineDocument());
  const armEva = (plan: DayPlan) => ({ plan, ...armEngine });
  const restraint = { key: 'afr', name: 'Arm foot restraint', kind: 'foot-restraint' as const };
  /** EVA 1: EV1 carries the restraint out and installs it on ARM-1's end (or brings it back in). */
  const setUp = (install: boolean) =>
    buildDayPlan({
      manifest: [{ ...restraint, carriedBy: 'EV1', leaveOutside: install }],
      tasks: [
        dayTask('Put the restraint on the arm', K.a1, 'EV1', 300, {
          actions: install ? [{ do: 'install' as const, item: 'afr', at: 'ARM-1' }] : [],
        }),
      ],
    });
  /** EVA 2 rides the arm; its manifest expects the restraint on the arm's end. */
  const ride = buildDayPlan({
    manifest: [{ ...restraint, installedAt: 'ARM-1', leaveOutside: true }],
    tasks: [dayTask('Off the truss', 'WX', 'EV1', 600, { arm: { key: 'ARM-1', ingress: K.a1 } })],
  });

  it('installed in EVA 1, it is on the arm when EVA 2 begins: no warning, and it is listed as found outside', () => {
    const [one, two] = computeSeries([armEva(setUp(true)), armEva(ride)]);
    expect(codes(one.timeline)).toEqual([]);
    expect(one.outsideAfter.map((o) => [o.item, o.where])).toEqual([
      ['afr', { kind: 'installed', node: 'ARM-1' }],
    ]);
    expect(two.start.items).toEqual({ afr: { kind: 'installed', node: 'ARM-1' } });
    expect(firstWhere(two.timeline, 'afr')).toEqual({ kind: 'installed', node: 'ARM-1' });
    expect(codes(two.timeline)).toEqual([]);
    expect(two.warnings).toEqual([]);
    expect(two.foundOutside.map((o) => [o.item, o.leftBy])).toEqual([['afr', 0]]);
  });

  it('brought back in by EVA 1, EVA 2 starts with it in the airlock: told so, and the arm has no restraint', () => {
    const [, two] = computeSeries([armEva(setUp(false)), armEva(ride)]);
    expect(two.start.items).toEqual({ afr: { kind: 'airlock' } });
    expect(codes(two.timeline)).toContain('restraint-missing');
    expect(two.warnings.map((w) => w.code).sort()).toEqual(['restraint-missing', 'start-differs']);
  });
});
