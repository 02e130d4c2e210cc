// Entry of a worker thread written in TypeScript: `new Worker(thisFile, { argv: ['./entry.ts'] })`.
// Node does not load TypeScript by itself, and a worker does not inherit the parent's tsx loader
// (under vitest there is none), so this registers tsx in the thread, with the project's tsconfig
// for the @shared/ path alias, and then loads the entry named (relative to this folder).
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../../../tsconfig.json', import.meta.url)) });
await import(new URL(process.argv[2], import.meta.url).href);
