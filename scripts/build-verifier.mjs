// Bundles the standalone evidence verifier (src/cli/verify-folder.ts) into build/evidence/verify.mjs,
// which every evidence bundle carries. Run after `vite build`, which empties build/.
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { verifierBuildOptions } from '../src/lib/server/evidence/verifier-build.js';

const root = (relative) => fileURLToPath(new URL(`../${relative}`, import.meta.url));
const outfile = process.argv[2] ?? root('build/evidence/verify.mjs');
await build(verifierBuildOptions(root('src/cli/verify-folder.ts'), outfile));
console.log(`evidence verifier: ${outfile}`);
