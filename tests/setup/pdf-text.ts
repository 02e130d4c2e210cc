import { expect } from 'vitest';
import type { TestAgent } from './test-app';

/**
 * The text of an uncompressed pdfkit PDF: each font's ToUnicode map decodes the hex glyph strings
 * of the TJ operators that follow its `Tf`.
 */
export function pdfText(pdf: Buffer): string {
  const raw = pdf.toString('latin1');
  const objects = new Map<string, string>();
  for (const m of raw.matchAll(/(\d+) 0 obj\s*([\s\S]*?)endobj/g)) objects.set(m[1], m[2]);
  const cmapOf = (ref: string) => {
    const map = new Map<string, string>();
    const body = objects.get(ref) ?? '';
    for (const r of body.matchAll(/<([0-9a-f]{4})> <([0-9a-f]{4})> \[([^\]]*)\]/gi)) {
      const start = parseInt(r[1], 16);
      [...r[3].matchAll(/<([0-9a-f ]*)>/gi)].forEach((e, i) => {
        const chars = e[1]
          .split(' ')
          .filter(Boolean)
          .map((h) => String.fromCodePoint(parseInt(h, 16)));
        map.set((start + i).toString(16).padStart(4, '0'), chars.join(''));
      });
    }
    return map;
  };
  // resource name (F1, F2…) → font object → ToUnicode map
  const fonts = new Map<string, Map<string, string>>();
  for (const m of raw.matchAll(/\/(F\d+) (\d+) 0 R/g)) {
    const font = objects.get(m[2]) ?? '';
    const toUnicode = /\/ToUnicode (\d+) 0 R/.exec(font);
    if (toUnicode && !fonts.has(m[1])) fonts.set(m[1], cmapOf(toUnicode[1]));
  }
  let out = '';
  let current: Map<string, string> | undefined;
  for (const m of raw.matchAll(/\/(F\d+) [\d.]+ Tf|\[([<>0-9a-f .-]*)\] TJ|^(ET)$/gim)) {
    if (m[1]) current = fonts.get(m[1]);
    else if (m[3]) out += '\n';
    else if (m[2] && current) {
      for (const h of m[2].matchAll(/<([0-9a-f]*)>/gi)) {
        for (let i = 0; i < h[1].length; i += 4) out += current.get(h[1].slice(i, i + 4)) ?? '';
      }
    }
  }
  return out;
}

/** GET a PDF with the agent, its body as bytes. */
export function getPdf(agent: TestAgent, url: string) {
  return agent
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
}

/** Checks an answer is a PDF set in the app's font (Inter, embedded) and gives its text. */
export function pdfAnswerText(res: {
  status: number;
  headers: Record<string, string>;
  body: unknown;
}): string {
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('application/pdf');
  const pdf = res.body as Buffer;
  expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  expect(pdf.toString('latin1')).toMatch(/\/FontName \/[A-Z]{6}\+Inter/);
  return pdfText(pdf);
}
