import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CSV_HEADER } from '../../server/modules/plans/plan-export.service';
import { LINE_KEYS as K, lineStationDocument } from '../factories/day';
import { getPdf, pdfText } from '../setup/pdf-text';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';
import { fromWire } from '@shared/compute/day/wire';

let t: TestApp;
let planner: TestAgent;
let stationId: number;

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(lineStationDocument()));
  planner = await t.agent('planner');
});
afterAll(() => t.close());

const task = (title: string, worksite: string, crew: string, more: Record<string, unknown> = {}) => ({
  title,
  worksite,
  crew,
  durationSeconds: 300,
  ...more,
});
const restraint = (more: Record<string, unknown> = {}) => ({
  key: 'fr-1',
  name: 'Foot restraint 1',
  kind: 'foot-restraint',
  carriedBy: 'EV1',
  ...more,
});
const install = { do: 'install', item: 'fr-1', at: K.s2 };
const remove = { do: 'remove', item: 'fr-1', at: K.s2 };

/** The codes of the day a plan gives (each once), after creating it on the line station. */
async function dayCodes(tasks: unknown[], manifest: unknown[] = []) {
  const created = await planner.post('/api/plans').send({
    title: 'Day check',
    stationId,
    date: '2031-05-01',
    crew: { EV1: { name: 'Avery', tetherLengthM: 12 }, EV2: { name: 'Brook', tetherLengthM: 12 } },
    routeMode: 'fewest-swaps',
    tasks,
    manifest,
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const res = await planner.get(`/api/plans/${created.body.id}/timeline`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return {
    id: created.body.id as number,
    codes: [...new Set(res.body.warnings.map((w: { code: string }) => w.code))].sort() as string[],
    body: fromWire(res.body) as ReturnType<typeof JSON.parse>,
  };
}

describe('each warning of the continuous day, with the plan that triggers it and the one that clears it', () => {
  it('restraint-missing: a task in S2 with no restraint installed there; cleared by installing one first', async () => {
    const bad = await dayCodes([task('Work', K.w2, 'EV1', { socket: K.s2 })]);
    expect(bad.codes).toContain('restraint-missing');
    const w = bad.body.warnings.find((x: { code: string }) => x.code === 'restraint-missing');
    expect(w).toMatchObject({ taskIndex: 0, crew: 'EV1' });
    const good = await dayCodes(
      [
        task('Install', K.w2, 'EV1', { actions: [install] }),
        task('Work', K.w2, 'EV1', { socket: K.s2 }),
        task('Take it out', K.w2, 'EV1', { actions: [remove] }),
      ],
      [restraint()],
    );
    expect(good.codes).toEqual([]);
  });

  it('restraint-occupied: EV2 gets into the restraint EV1 still stands in; cleared when EV1 is out first', async () => {
    const manifest = [restraint({ installedAt: K.s2, leaveOutside: true })];
    const bad = await dayCodes(
      [
        task('EV1 works long', K.w2, 'EV1', { socket: K.s2, durationSeconds: 3000 }),
        task('EV2 wants the same restraint', K.w2, 'EV2', { socket: K.s2 }),
      ],
      manifest,
    );
    expect(bad.codes).toEqual(['restraint-occupied']);
    expect(bad.body.warnings[0]).toMatchObject({ taskIndex: 1, crew: 'EV2' });
    const good = await dayCodes(
      [
        task('EV1 works', K.w2, 'EV1', { socket: K.s2, durationSeconds: 60 }),
        task('EV2 goes elsewhere first', K.w3, 'EV2', { durationSeconds: 1200 }),
        task('EV2 then uses the restraint', K.w2, 'EV2', { socket: K.s2 }),
      ],
      manifest,
    );
    expect(good.codes).toEqual([]);
  });

  it('socket-occupied: installing a second restraint in a socket that has one; cleared by another socket', async () => {
    const manifest = [
      restraint({ installedAt: K.s2, leaveOutside: true }),
      restraint({ key: 'fr-2', name: 'Foot restraint 2' }),
    ];
    const bad = await dayCodes(
      [task('Install the second', K.w2, 'EV1', { actions: [{ do: 'install', item: 'fr-2', at: K.s2 }] })],
      manifest,
    );
    expect(bad.codes).toEqual(['socket-occupied']);
    expect(bad.body.warnings[0]).toMatchObject({ taskIndex: 0, crew: 'EV1', item: 'fr-2' });
    const good = await dayCodes([task('Leave it in the bag', K.w2, 'EV1')], manifest);
    expect(good.codes).toEqual([]);
  });

  it('item-not-there: picking up a bag where it is not; cleared by picking it up where it was set down', async () => {
    const manifest = [{ key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV1' }];
    const bad = await dayCodes(
      [
        task('Set the bag down', K.w1, 'EV1', { actions: [{ do: 'set-down', item: 'bag' }] }),
        task('Pick it up elsewhere', K.w3, 'EV1', { actions: [{ do: 'pick-up', item: 'bag' }] }),
      ],
      manifest,
    );
    expect(bad.codes).toEqual(['item-not-there', 'left-outside']);
    expect(bad.body.warnings.find((w: { code: string }) => w.code === 'item-not-there')).toMatchObject({
      taskIndex: 1,
      crew: 'EV1',
      item: 'bag',
    });
    const good = await dayCodes(
      [
        task('Set the bag down', K.w1, 'EV1', { actions: [{ do: 'set-down', item: 'bag' }] }),
        task('Pick it up again', K.w1, 'EV1', { actions: [{ do: 'pick-up', item: 'bag' }] }),
      ],
      manifest,
    );
    expect(good.codes).toEqual([]);
  });

  it('item-not-held: EV2 hands over a bag EV1 holds; cleared when the holder hands it over', async () => {
    const manifest = [{ key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV1' }];
    const bad = await dayCodes(
      [task('Hand over', K.w1, 'both', { actions: [{ do: 'hand-over', item: 'bag', by: 'EV2' }] })],
      manifest,
    );
    expect(bad.codes).toEqual(['item-not-held']);
    const good = await dayCodes(
      [task('Hand over', K.w1, 'both', { actions: [{ do: 'hand-over', item: 'bag', by: 'EV1' }] })],
      manifest,
    );
    expect(good.codes).toEqual([]);
  });

  it('tool-not-at-hand: EV1 needs the driver EV2 carries; cleared when EV1 carries it', async () => {
    const bad = await dayCodes(
      [task('Drive bolts', K.w1, 'EV1', { tools: ['driver'] })],
      [{ key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV2' }],
    );
    expect(bad.codes).toEqual(['tool-not-at-hand']);
    expect(bad.body.warnings[0]).toMatchObject({ taskIndex: 0, crew: 'EV1', item: 'driver' });
    const good = await dayCodes(
      [task('Drive bolts', K.w1, 'EV1', { tools: ['Power driver'] })],
      [{ key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' }],
    );
    expect(good.codes).toEqual([]);
  });

  it('left-outside: a bag set down and never brought back; cleared by marking it to stay outside', async () => {
    const tasks = [task('Stage the bag', K.w3, 'EV2', { actions: [{ do: 'set-down', item: 'bag' }] })];
    const bad = await dayCodes(tasks, [{ key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV2' }]);
    expect(bad.codes).toEqual(['left-outside']);
    expect(bad.body.warnings[0]).toMatchObject({ item: 'bag' });
    const good = await dayCodes(tasks, [
      { key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV2', leaveOutside: true },
    ]);
    expect(good.codes).toEqual([]);
    const bag = good.body.equipment.find((e: { item: string }) => e.item === 'bag');
    expect(bag.states[bag.states.length - 1].where).toEqual({ kind: 'at', node: K.w3 });
  });

  it('a portable anchor installed at W1 becomes an attach point: the next route from there swaps at it', async () => {
    const manifest = [{ key: 'anchor', name: 'Portable anchor', kind: 'tether-anchor', carriedBy: 'EV1' }];
    const go = [
      task('Set the anchor', K.w1, 'EV1', { actions: [{ do: 'install', item: 'anchor' }] }),
      task('Work further out', K.w3, 'EV1'),
      task('Take the anchor back', K.w1, 'EV1', { actions: [{ do: 'remove', item: 'anchor' }] }),
    ];
    const { codes, body } = await dayCodes(go, manifest);
    expect(codes).toEqual([]);
    const swapsAt = body.crew.EV1.blocks
      .filter((b: { type: string }) => b.type === 'swap')
      .map((b: { swapNode: string }) => b.swapNode);
    expect(swapsAt).toContain(K.w1);
  });

  it('the exports carry the day: each CSV row the tether state after its block and the equipment steps of its task, the cue cards the same steps', async () => {
    const manifest = [{ key: 'anchor', name: 'Portable anchor', kind: 'tether-anchor', carriedBy: 'EV1' }];
    const { id, body } = await dayCodes(
      [
        task('Set the anchor', K.w1, 'EV1', { actions: [{ do: 'install', item: 'anchor' }] }),
        task('Work further out', K.w3, 'EV1'),
        task('Take the anchor back', K.w1, 'EV1', { actions: [{ do: 'remove', item: 'anchor' }] }),
      ],
      manifest,
    );
    const csv = await planner.get(`/api/plans/${id}/export.csv`).buffer(true);
    expect(csv.status).toBe(200);
    const [header, ...rows] = Papa.parse<string[]>(csv.text.trim(), { skipEmptyLines: true }).data;
    expect(header).toEqual(CSV_HEADER);
    const col = (name: string) => header.indexOf(name);
    const ev1 = rows.filter((r) => r[col('crew')].startsWith('EV1'));
    const blocks = body.crew.EV1.blocks as {
      type: string;
      taskIndex?: number;
      swapNode?: string;
      tetherAtEnd?: { anchor: string; paidOutM: number };
    }[];
    expect(ev1).toHaveLength(blocks.length);
    let checked = 0;
    blocks.forEach((b, k) => {
      const after = b.tetherAtEnd ?? (b.type === 'swap' ? { anchor: b.swapNode!, paidOutM: 0 } : null);
      if (!after) return;
      expect(ev1[k][col('tether_anchor')], `block ${k}`).toBe(after.anchor);
      expect(Number(ev1[k][col('tether_out_m')]), `block ${k}`).toBeCloseTo(after.paidOutM, 1);
      checked++;
    });
    expect(checked).toBeGreaterThan(3);
    const workOf = (title: string) => ev1.find((r) => r[col('type')] === 'work' && r[col('task')] === title)!;
    const installed = workOf('Set the anchor')[col('equipment')];
    const removed = workOf('Take the anchor back')[col('equipment')];
    expect(installed).toContain('Portable anchor');
    expect(installed).toContain(K.w1);
    expect(removed).toContain('Portable anchor');
    expect(workOf('Work further out')[col('equipment')]).toBe('');
    const pdf = await getPdf(planner, `/api/plans/${id}/export.pdf`);
    expect(pdf.status).toBe(200);
    const text = pdfText(pdf.body as Buffer);
    expect(text).toContain(installed);
    expect(text).toContain(removed);
  });
});

describe('bad plan documents are refused with the JSON path', () => {
  const base = {
    title: 'Bad',
    date: '2031-05-01',
    crew: { EV1: { name: 'A', tetherLengthM: 12 }, EV2: { name: 'B', tetherLengthM: 12 } },
  };
  const post = (tasks: unknown[], manifest: unknown[] = []) =>
    planner.post('/api/plans').send({ ...base, stationId, tasks, manifest });

  it('an action on an unknown item key', async () => {
    const res = await post([task('x', K.w1, 'EV1', { actions: [{ do: 'pick-up', item: 'nope' }] })]);
    expect(res.status).toBe(400);
    expect(res.body.error.details).toContainEqual({
      path: 'body.tasks[0].actions[0].item',
      message: expect.stringContaining('nope'),
    });
  });

  it('`sockets` on a one-person task, and both `socket` and `sockets` on a task for both', async () => {
    const res = await post([
      task('x', K.w2, 'EV1', { sockets: { EV1: K.s2 } }),
      task('y', K.w2, 'both', { socket: K.s2, sockets: { EV2: K.s2 } }),
    ]);
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['body.tasks[0].sockets', 'body.tasks[1].socket']));
  });

  it('a hand-over in a one-person task', async () => {
    const res = await post(
      [task('x', K.w1, 'EV1', { actions: [{ do: 'hand-over', item: 'bag' }] })],
      [{ key: 'bag', name: 'Bag', kind: 'bag', carriedBy: 'EV1' }],
    );
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('body.tasks[0].actions[0].do');
  });

  it('both crew members in one foot restraint', async () => {
    const res = await post([task('x', K.w2, 'both', { sockets: { EV1: K.s2, EV2: K.s2 } })]);
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('body.tasks[0].sockets.EV2');
  });

  it('duplicate item keys, and a restraint installed somewhere that is not a socket', async () => {
    const res = await post(
      [],
      [restraint({ installedAt: K.w1 }), { key: 'fr-1', name: 'Other', kind: 'bag', carriedBy: 'EV2' }],
    );
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['body.manifest[1].key', 'body.manifest[0].installedAt']));
  });
});
