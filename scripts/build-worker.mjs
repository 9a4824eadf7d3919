// Bundles the check worker (src/lib/server/checks/worker.ts) into build/workers/check-worker.mjs.
// Run after `vite build`, which empties build/: "build": "vite build && node scripts/build-worker.mjs".
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { workerBuildOptions } from '../src/lib/server/checks/bundle.js';

const root = (relative) => fileURLToPath(new URL(`../${relative}`, import.meta.url));
const outfile = process.argv[2] ?? root('build/workers/check-worker.mjs');
await build(workerBuildOptions(root('src/lib/server/checks/worker.ts'), outfile));
console.log(`check worker: ${outfile}`);
