// Launcher of the command line: `node scripts/cli.mjs certify -- …` runs build/cli/certify.cjs,
// building the bundles first (esbuild, a second or two) when missing or older than the sources.
// The engine's bundles run through a V8 code cache (NAME.cjs.cache, written on the first run and
// whenever V8 rejects it), which spares compiling them on every start.
import { readFileSync, renameSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Script } from 'node:vm';
import { bundleFile, CACHED, ENTRIES, isCurrent } from './cli-bundle.mjs';

const [name, ...args] = process.argv.slice(2);
if (!(name in ENTRIES)) {
	console.error(`usage: node scripts/cli.mjs ${Object.keys(ENTRIES).join('|')} [arguments]`);
	process.exit(2);
}
if (!isCurrent(name)) {
	const { buildCli } = await import('./cli-bundle.mjs');
	await buildCli();
}
const bundle = bundleFile(name);
// The bundle reads its arguments from process.argv as if started directly.
process.argv = [process.argv[0], bundle, ...args];
if (CACHED.includes(name)) runCached(bundle);
else await import(pathToFileURL(bundle).href);

function runCached(file) {
	const cacheFile = `${file}.cache`;
	let cachedData;
	try {
		cachedData = readFileSync(cacheFile);
	} catch {
		cachedData = undefined;
	}
	const source = `(function (exports, require, module, __filename, __dirname) {${readFileSync(file, 'utf8')}\n})`;
	const script = new Script(source, { filename: file, cachedData });
	if (!cachedData || script.cachedDataRejected) {
		// After the run, so that the functions it compiled are in the cache too.
		process.once('beforeExit', () => {
			const part = `${cacheFile}.${process.pid}.part`;
			writeFileSync(part, script.createCachedData());
			renameSync(part, cacheFile);
		});
	}
	const module = { exports: {} };
	const run = script.runInThisContext();
	run.call(module.exports, module.exports, createRequire(file), module, file, path.dirname(file));
}
