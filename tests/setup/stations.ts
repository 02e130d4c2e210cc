import { expect } from 'vitest';
import type { ImportStationResult, StationGraph } from '@shared/schemas/station-edits';
import type { AppConfig } from '../../server/lib/env';
import { buildStationDocument, stationDocumentFile } from '../factories/station-document';
import { makeTestApp, type TestAgent, type TestApp } from './test-app';

/**
 * `POST /api/stations/import` of `doc` as a file, as `agent`: the response, for the test to check.
 * A Buffer is sent as it is (bytes that are no document at all); anything else as its JSON.
 */
export function postStationDocument(
  agent: TestAgent,
  doc: unknown = buildStationDocument(),
  fileName = 'station.json',
) {
  const file = Buffer.isBuffer(doc) ? doc : stationDocumentFile(doc);
  return agent.post('/api/stations/import').attach('file', file, fileName);
}

/** Imports `doc` (the factory station unless given) as `agent`, an engineer; fails unless created. */
export async function importStation(
  agent: TestAgent,
  doc: unknown = buildStationDocument(),
): Promise<ImportStationResult['station']> {
  const res = await postStationDocument(agent, doc);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.station;
}

/**
 * A fresh test app (see `makeTestApp`) with `doc` (the factory station unless given) imported by
 * the demo engineer: the app and the station as the import answered it.
 */
export async function makeAppWithStation(
  doc: unknown = buildStationDocument(),
  config: Partial<AppConfig> = {},
): Promise<{ t: TestApp; station: ImportStationResult['station'] }> {
  const t = await makeTestApp(config);
  return { t, station: await importStation(await t.agent('engineer'), doc) };
}

/** `GET /api/stations/:id/graph` as `agent`. */
export async function stationGraph(agent: TestAgent, id: number): Promise<StationGraph> {
  const res = await agent.get(`/api/stations/${id}/graph`);
  expect(res.status).toBe(200);
  return res.body;
}
