// Launcher of the command line: `node scripts/cli.mjs certify -- …` runs build/cli/certify.cjs,
// building the bundles first (esbuild, a second or two) when missing or older than the sources.
// The engine's bundles run through a V8 code cache (NAME.cjs.HASH.cache, written on the first run
// and whenever V8 rejects it), which spares compiling them on every start. HASH is the bundle's own:
// V8 checks only the source's length, so a rebuilt bundle of the same length must not meet old code.
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
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
	const code = readFileSync(file, 'utf8');
	const hash = createHash('sha256').update(code).digest('hex').slice(0, 16);
	const cacheFile = `${file}.${hash}.cache`;
	let cachedData;
	try {
		cachedData = readFileSync(cacheFile);
	} catch {
		cachedData = undefined;
	}
	const source = `(function (exports, require, module, __filename, __dirname) {${code}\n})`;
	const script = new Script(source, { filename: file, cachedData });
	if (!cachedData || script.cachedDataRejected) {
		// After the run, so that the functions it compiled are in the cache too.
		process.once('beforeExit', () => {
			const part = `${cacheFile}.${process.pid}.part`;
			writeFileSync(part, script.createCachedData());
			renameSync(part, cacheFile);
			dropOtherCaches(file, cacheFile);
		});
	}
	const module = { exports: {} };
	const run = script.runInThisContext();
	run.call(module.exports, module.exports, createRequire(file), module, file, path.dirname(file));
}

/** Caches of earlier builds of this bundle go once the current one is written. */
function dropOtherCaches(file, kept) {
	const folder = path.dirname(file);
	const prefix = `${path.basename(file)}.`;
	for (const entry of readdirSync(folder))
		if (entry.startsWith(prefix) && entry.endsWith('.cache') && path.join(folder, entry) !== kept)
			rmSync(path.join(folder, entry), { force: true });
}
