#!/usr/bin/env node
// `npm test`: every test — unit, server integration, client and browser tests — in one Vitest run.
// The browser tests need Debian's Chromium; when it is missing and we are root with apt, install it.
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';

const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

function ensureChromium() {
  if (fs.existsSync(CHROMIUM)) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  const hasApt = spawnSync('sh', ['-c', 'command -v apt-get'], { stdio: 'ignore' }).status === 0;
  if (!isRoot || !hasApt) {
    console.error(
      `Chromium is missing at ${CHROMIUM}: install it with "sudo apt-get install -y chromium" (or set CHROMIUM_PATH), then run npm test again.`,
    );
    process.exit(1);
  }
  console.log('Installing Debian chromium for the browser tests…');
  execFileSync(
    'sh',
    ['-c', 'apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium'],
    {
      stdio: 'inherit',
    },
  );
}

ensureChromium();
const args = ['vitest', 'run', ...process.argv.slice(2)];
const result = spawnSync('npx', args, { stdio: 'inherit', env: { ...process.env, CHROMIUM_PATH: CHROMIUM } });
process.exit(result.status ?? 1);
