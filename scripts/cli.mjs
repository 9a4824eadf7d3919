// Launcher of the command line: `node scripts/cli.mjs certify -- …` runs build/cli/certify.mjs,
// building the bundles first (esbuild, a second or two) when missing or older than the sources.
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { ENTRIES, isCurrent, outdir } from './cli-bundle.mjs';

const [name, ...args] = process.argv.slice(2);
if (!(name in ENTRIES)) {
	console.error(`usage: node scripts/cli.mjs ${Object.keys(ENTRIES).join('|')} [arguments]`);
	process.exit(2);
}
if (!isCurrent(name)) {
	const { buildCli } = await import('./cli-bundle.mjs');
	await buildCli();
}
const bundle = path.join(outdir, `${name}.mjs`);
// The bundle reads its arguments from process.argv as if started directly.
process.argv = [process.argv[0], bundle, ...args];
await import(pathToFileURL(bundle).href);
