// The client bundle as a browser meets it: a production build into a scratch directory, then each
// JavaScript chunk's size minified and gzipped. Targets: no chunk over the bundler's 500 kB warning,
// and the app shell (what index.html loads before any screen) at most 150 kB gzipped.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';

const CHUNK_LIMIT_KB = 500;
const SHELL_LIMIT_KB = 150;

export async function run(): Promise<boolean> {
  const out = fs.mkdtempSync(path.join(os.tmpdir(), 'tw-bundle-'));
  try {
    execFileSync('npx', ['vite', 'build', '--outDir', out, '--logLevel', 'error'], { stdio: 'inherit' });
    const assets = path.join(out, 'assets');
    const chunks = fs
      .readdirSync(assets)
      .filter((f) => f.endsWith('.js'))
      .map((f) => {
        const bytes = fs.readFileSync(path.join(assets, f));
        return { name: f, kb: bytes.length / 1000, gzipKb: zlib.gzipSync(bytes).length / 1000 };
      })
      .sort((a, b) => b.kb - a.kb);
    const html = fs.readFileSync(path.join(out, 'index.html'), 'utf8');
    const shell = chunks.filter((c) => html.includes(`assets/${c.name}`));
    const shellGzip = shell.reduce((s, c) => s + c.gzipKb, 0);
    console.log('chunk'.padEnd(40), 'minified'.padStart(10), 'gzip'.padStart(10));
    for (const c of chunks.slice(0, 8))
      console.log(
        c.name.padEnd(40),
        `${c.kb.toFixed(1)} kB`.padStart(10),
        `${c.gzipKb.toFixed(1)} kB`.padStart(10),
      );
    const largest = chunks[0];
    const okChunks = largest.kb <= CHUNK_LIMIT_KB;
    const okShell = shellGzip <= SHELL_LIMIT_KB;
    console.log(
      `largest chunk ${largest.kb.toFixed(0)} kB (limit ${CHUNK_LIMIT_KB}) ${okChunks ? 'PASS' : 'FAIL'}; ` +
        `app shell ${shell.length} chunks, ${shellGzip.toFixed(1)} kB gzip (limit ${SHELL_LIMIT_KB}) ${okShell ? 'PASS' : 'FAIL'}; ` +
        `${chunks.length} chunks in all`,
    );
    return okChunks && okShell;
  } finally {
    fs.rmSync(out, { recursive: true, force: true });
  }
}
