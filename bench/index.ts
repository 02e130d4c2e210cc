// `npm run bench`: every bench/*.bench.ts in turn. Each prints its own figures and its ratios to a
// reference measured in the same run, so the numbers compare like with like on this machine.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = path.dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = fs
  .readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

console.log(
  `Tetherwise benchmarks — ${os.cpus()[0]?.model ?? 'cpu'} ×${os.cpus().length}, node ${process.version}`,
);
const started = performance.now();
let failed = false;
for (const file of files) {
  console.log(`\n━━ ${file.replace('.bench.ts', '')} ━━`);
  const mod = (await import(pathToFileURL(path.join(here, file)).href)) as {
    run: () => Promise<boolean | void>;
  };
  const t0 = performance.now();
  const ok = await mod.run();
  if (ok === false) failed = true;
  console.log(`(${file}: ${((performance.now() - t0) / 1000).toFixed(1)} s)`);
}
console.log(
  `\nAll benchmarks: ${((performance.now() - started) / 1000).toFixed(1)} s${failed ? ' — some targets missed (see FAIL above)' : ''}`,
);
