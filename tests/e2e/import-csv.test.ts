import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import { buildStationDocument } from '../factories/station-document';
import { openBrowserPerTest, signInAs, type BrowserSession } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const csv = (...lines: string[]) => Buffer.from(lines.join('\n') + '\n');

describe('CSV import from the station screen', () => {
  it('the engineer checks the files (every problem at once), fixes them, confirms, and the model takes them', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'engineer');
    const name = `CSV import station ${Date.now()}`;
    const made = await page.request.post('/api/stations/import', {
      multipart: {
        file: {
          name: 'station.json',
          mimeType: 'application/json',
          buffer: Buffer.from(JSON.stringify(buildStationDocument({ name }))),
        },
      },
    });
    expect(made.status()).toBe(201);
    const station = ((await made.json()) as { station: StationSummary }).station;

    await session.goto(`/stations/${station.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('button', { name: 'Import CSV…' }).click();
    const dialog = page.getByRole('dialog', { name: `Import CSV into ${name}` });
    const form = dialog.getByRole('form', { name: 'Import CSV' });
    // a bad cell, a repeated key and an edge to a node that is nowhere: one check names all three
    session.expectHttpError(`/api/stations/${station.id}/import-csv`, 400);
    await form.getByLabel('Nodes CSV').setInputFiles({
      name: 'nodes.csv',
      mimeType: 'text/csv',
      buffer: csv(
        'key,kind,x,y,z',
        'CSV-A1,anchor,11,0,1.5',
        'CSV-A1,anchor,12,0,1.5',
        'CSV-A2,anchor,east,0,1.5',
      ),
    });
    await form.getByLabel('Edges CSV').setInputFiles({
      name: 'edges.csv',
      mimeType: 'text/csv',
      buffer: csv('from,to,kind', 'T1-A02,CSV-A1,handrail', 'CSV-A1,GHOST-9,handrail'),
    });
    await form.getByRole('button', { name: 'Check the files' }).click();
    const problems = form.getByRole('list', { name: 'Import problems' });
    await problems.waitFor();
    await expect(problems.getByRole('listitem').allTextContents()).resolves.toEqual(
      expect.arrayContaining([
        expect.stringContaining('nodes.csv line 4, column x'),
        expect.stringContaining('nodes.csv line 3, column key'),
        expect.stringContaining('edges.csv line 3, column to'),
      ]),
    );
    await session.screenshot('import-csv-problems');

    await form.getByLabel('Nodes CSV').setInputFiles({
      name: 'nodes.csv',
      mimeType: 'text/csv',
      buffer: csv('key,kind,x,y,z', 'CSV-A1,anchor,11,0,1.5', 'CSV-A2,anchor,12,0,1.5'),
    });
    await form.getByLabel('Edges CSV').setInputFiles({
      name: 'edges.csv',
      mimeType: 'text/csv',
      buffer: csv('from,to,kind', 'T1-A02,CSV-A1,handrail', 'CSV-A1,CSV-A2,handrail'),
    });
    await form.getByRole('button', { name: 'Check the files' }).click();
    await form.getByText('The files check out').waitFor();
    expect(await form.getByTestId('csv-check-counts').textContent()).toBe(
      'The import adds 2 nodes and changes 0; adds 2 edges and changes 0.',
    );
    // nothing is written by the check
    const before = (await (await page.request.get(`/api/stations/${station.id}`)).json()) as StationSummary;
    expect(before.version).toBe(station.version);
    await session.screenshot('import-csv-confirm');
    await form.getByRole('button', { name: 'Import', exact: true }).click();
    await form.getByText(`Imported into ${name}: version ${station.version + 1}`).waitFor();
    await expect(form.getByTestId('csv-import-counts').textContent()).resolves.toContain(
      'Written: added 2 nodes and changed 0; added 2 edges and changed 0.',
    );
    await session.screenshot('import-csv-done');
    const graph = (await (await page.request.get(`/api/stations/${station.id}/graph`)).json()) as {
      nodes: { key: string }[];
    };
    expect(graph.nodes.map((n) => n.key)).toEqual(expect.arrayContaining(['CSV-A1', 'CSV-A2']));

    const del = await page.request.delete(`/api/stations/${station.id}?version=${station.version + 1}`);
    expect(del.status()).toBe(204);
  });
});
