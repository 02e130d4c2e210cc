import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { buildPlanInput, buildTask } from '../factories/plan';
import { getPdf, pdfText } from '../setup/pdf-text';
import { makeAppWithStation } from '../setup/stations';
import type { TestApp } from '../setup/test-app';
import { CSV_HEADER } from '../../server/modules/plans/plan-export.service';

let t: TestApp;
let stationId: number;

beforeAll(async () => {
  const doc = buildStationDocument();
  doc.edges = doc.edges.map((e) =>
    e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e,
  );
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(doc));
});
afterAll(() => t.close());

const tasks = [buildTask({ title: 'Open the cover', durationSeconds: 600 })];

async function create(body: Record<string, unknown>) {
  return (await t.agent('planner'))
    .post('/api/plans')
    .send({ ...buildPlanInput(stationId, { date: '2031-06-12', tasks }), ...body });
}

describe('a plan start in GMT', () => {
  it('is kept as an ISO date and time in GMT: a time of day alone is on the plan date', async () => {
    const res = await create({ startGmt: '09:30' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.startGmt).toBe('2031-06-12T09:30:00Z');
    const read = await (await t.agent('viewer')).get(`/api/plans/${res.body.id}`);
    expect(read.body.startGmt).toBe('2031-06-12T09:30:00Z');
  });

  it('is optional (null when not given), read with its offset, and cleared with null', async () => {
    const planner = await t.agent('planner');
    const res = await create({});
    expect(res.status).toBe(201);
    expect(res.body.startGmt).toBeNull();
    const set = await planner
      .patch(`/api/plans/${res.body.id}`)
      .send({ version: 1, startGmt: '2031-06-12T11:45:00+02:00' });
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    expect(set.body.startGmt).toBe('2031-06-12T09:45:00Z');
    // a later edit of something else keeps it
    const renamed = await planner.patch(`/api/plans/${res.body.id}`).send({ version: 2, title: 'Renamed' });
    expect(renamed.body.startGmt).toBe('2031-06-12T09:45:00Z');
    const cleared = await planner.patch(`/api/plans/${res.body.id}`).send({ version: 3, startGmt: null });
    expect(cleared.status).toBe(200);
    expect(cleared.body.startGmt).toBeNull();
  });

  it('refuses what is not a time with a 400 at body.startGmt', async () => {
    for (const startGmt of ['half past nine', '25:00', '2031-06-12 09:30', 930]) {
      const res = await create({ startGmt });
      expect(res.status, String(startGmt)).toBe(400);
      expect(res.body.error.code).toBe('VALIDATION_FAILED');
      expect(res.body.error.details).toContainEqual(expect.objectContaining({ path: 'body.startGmt' }));
    }
  });

  it('goes with a duplicate', async () => {
    const res = await create({ startGmt: '06:00' });
    const copy = await (await t.agent('planner')).post(`/api/plans/${res.body.id}/duplicate`).send({});
    expect(copy.status, JSON.stringify(copy.body)).toBe(201);
    expect(copy.body.startGmt).toBe('2031-06-12T06:00:00Z');
  });

  it('exports carry GMT clock times beside elapsed ones: CSV columns and the cue cards', async () => {
    const res = await create({ startGmt: '23:30' });
    const viewer = await t.agent('viewer');
    const csv = await viewer.get(`/api/plans/${res.body.id}/export.csv`).buffer(true);
    expect(csv.status).toBe(200);
    const [header, ...rows] = Papa.parse<string[]>(csv.text.trim(), { skipEmptyLines: true }).data;
    expect(header).toEqual(CSV_HEADER);
    const col = (name: string) => header.indexOf(name);
    expect(rows[0][col('start')]).toBe('0:00');
    expect(rows[0][col('start_gmt')]).toBe('23:30');
    // every row's GMT is its elapsed start after 23:30, past midnight too (worked by hand)
    for (const r of rows) {
      const [h, m] = r[col('start')].split(':').map(Number);
      const total = (23 * 60 + 30 + h * 60 + m) % (24 * 60);
      const gmt = `${String(Math.floor(total / 60)).padStart(2, '0')}:${String(total % 60).padStart(2, '0')}`;
      expect(r[col('start_gmt')]).toBe(gmt);
    }
    const pdf = await getPdf(viewer, `/api/plans/${res.body.id}/export.pdf`);
    expect(pdf.status).toBe(200);
    const text = pdfText(pdf.body as Buffer);
    expect(text).toContain('starts 23:30 GMT');
    expect(text).toContain('23:30');
    expect(text).toMatch(/GMT/);

    const without = await create({});
    const plain = await viewer.get(`/api/plans/${without.body.id}/export.csv`).buffer(true);
    const [, first] = Papa.parse<string[]>(plain.text.trim(), { skipEmptyLines: true }).data;
    expect(first[col('start_gmt')]).toBe('');
  });
});
