// Bundles the command line (src/cli/*.ts, bench, coverage) into build/cli/*.mjs, so that it starts
// without a TypeScript loader. Run after `vite build`, which empties build/.
import { buildCli, outdir } from './cli-bundle.mjs';

await buildCli();
console.log(`command line: ${outdir}`);
