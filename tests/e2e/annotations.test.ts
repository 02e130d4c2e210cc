import { deflateSync, crc32 } from 'node:zlib';
import { request, type APIRequestContext } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { Annotation } from '@shared/schemas/annotations';
import type { StationSummary } from '@shared/schemas/station-edits';
import { type BrowserSession, openBrowserPerTest, signInAs, DEMO_PASSWORD } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

function chunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body) >>> 0);
  return Buffer.concat([length, body, crc]);
}

/** A real PNG (RGB, 8 bits), built from its bytes: a teal square with a white cross. */
function pngBytes(size = 24): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(size, 0);
  header.writeUInt32BE(size, 4);
  header[8] = 8; // bit depth
  header[9] = 2; // colour type RGB
  const rows: Buffer[] = [];
  for (let y = 0; y < size; y++) {
    const row = Buffer.alloc(1 + size * 3); // filter byte 0: none
    for (let x = 0; x < size; x++) {
      const cross = Math.abs(x - size / 2) < 2 || Math.abs(y - size / 2) < 2;
      row.set(cross ? [255, 255, 255] : [11, 107, 102], 1 + x * 3);
    }
    rows.push(row);
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', deflateSync(Buffer.concat(rows))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

const signIn = (role: string) => signInAs(session, role);

async function signOut() {
  await session.goto('/');
  await session.page.getByRole('button', { name: 'Sign out' }).click();
  await session.page.waitForURL('**/sign-in');
}

async function apiAs(role: string): Promise<APIRequestContext> {
  const api = await request.newContext({ baseURL: session.baseURL });
  const res = await api.post('/api/auth/sign-in', {
    data: { email: `${role}@example.org`, password: DEMO_PASSWORD },
  });
  expect(res.status()).toBe(200);
  return api;
}

describe('annotations on the station', () => {
  it('a trainer pins a note with an image to a node and replies; a viewer reads it, sees the image, and cannot write', async () => {
    const { page } = session;
    const api = await apiAs('viewer');
    const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
    const station = stations.find((s) => s.name === 'Kestrel Station')!;
    const title = `Handrail wear check ${Date.now()}`;

    await signIn('trainer');
    await session.goto(`/stations/${station.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByLabel('Find a node').fill('PB3-A01');
    await page
      .getByRole('option', { name: /^PB3-A01\b/ })
      .first()
      .click();
    await page.getByRole('tab', { name: 'Annotations' }).click();
    await page.getByRole('button', { name: 'New note' }).click();
    const form = page.getByRole('form', { name: 'New note' });
    await expect(form.getByLabel(/the selected node PB3-A01/).isChecked()).resolves.toBe(true);
    await form.getByLabel('Title').fill(title);
    await form.getByLabel('Note').fill('Tape lifting at the stanchion; photo attached.');
    await form.getByRole('button', { name: 'Pin note' }).click();

    const thread = page.getByRole('article', { name: title });
    await thread.waitFor();
    await thread.getByText('node PB3-A01').waitFor();
    // a text file named .png is refused by its content, and the server's reason is shown
    session.expectHttpError(/^\/api\/annotations\/\d+\/attachments$/, 415);
    await thread.getByLabel('Attach an image').setInputFiles({
      name: 'notes.png',
      mimeType: 'image/png',
      buffer: Buffer.from('not really a picture\n'),
    });
    await thread
      .getByRole('alert')
      .getByText(/Only PNG or JPE?G images can be attached; this file's content is not an image/)
      .waitFor();
    await thread
      .getByLabel('Attach an image')
      .setInputFiles({ name: 'stanchion.png', mimeType: 'image/png', buffer: pngBytes() });
    const image = thread.getByRole('img', { name: 'stanchion.png' });
    await image.waitFor();
    await thread.getByLabel('Reply').fill('Seen on the last walkdown too.');
    await thread.getByRole('button', { name: 'Add reply' }).click();
    await thread.getByText('Seen on the last walkdown too.').waitFor();
    await thread.getByText('1 reply').waitFor();
    await session.screenshot('annotations-trainer-thread');

    const saved = (
      (await (await api.get(`/api/stations/${station.id}/annotations`)).json()) as Annotation[]
    ).find((a) => a.title === title)!;
    expect(saved).toMatchObject({ nodeKey: 'PB3-A01', status: 'open', author: { name: 'Jonah Abara' } });
    expect(saved.replies.map((r) => r.body)).toEqual(['Seen on the last walkdown too.']);
    expect(saved.attachments).toMatchObject([{ fileName: 'stanchion.png', mimeType: 'image/png' }]);

    await signOut();
    await signIn('viewer');
    await session.goto(`/stations/${station.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('tab', { name: 'Annotations' }).click();
    const item = page.getByRole('list', { name: 'Notes' }).getByRole('button', { name: new RegExp(title) });
    await item.waitFor();
    expect(await item.textContent()).toContain('1 reply');
    const thumb = item.getByRole('img', { name: 'Thumbnail: stanchion.png' });
    await expect
      .poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
      .toBe(24);
    expect(await page.getByRole('button', { name: 'New note' }).count()).toBe(0);
    await session.screenshot('annotations-viewer-list');

    await item.click();
    const viewed = page.getByRole('article', { name: title });
    const full = viewed.getByRole('img', { name: 'stanchion.png' });
    await expect
      .poll(() => full.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
      .toBe(24);
    await viewed.getByText('Seen on the last walkdown too.').waitFor();
    for (const control of ['Add reply', 'Resolve', 'Reopen']) {
      expect(await viewed.getByRole('button', { name: control }).count()).toBe(0);
    }
    expect(await viewed.locator('input[type="file"], textarea').count()).toBe(0);
    await session.screenshot('annotations-viewer-thread');
    await api.dispose();
  });
});
