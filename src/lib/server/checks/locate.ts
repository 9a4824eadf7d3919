/**
 * Finds the bundled check worker: $RANKSEAL_CHECK_WORKER, else build/workers/check-worker.mjs
 * (written by scripts/build-worker.mjs after `vite build`), else a bundle made now from the
 * source with esbuild into a temporary folder, so that `vite dev` and tests need no build step.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { workerBuildOptions } from './bundle.js';

export const BUILT_WORKER = 'build/workers/check-worker.mjs';
const WORKER_SOURCE = 'src/lib/server/checks/worker.ts';

function workerSource(): string | null {
	// Next to this module in dev and tests; under the working directory otherwise.
	const here = path.join(path.dirname(fileURLToPath(import.meta.url)), 'worker.ts');
	if (existsSync(here)) return here;
	const fromRoot = path.resolve(WORKER_SOURCE);
	return existsSync(fromRoot) ? fromRoot : null;
}

/**
 * Bundles the worker source into `outfile` with esbuild, loaded from node_modules at run time:
 * bundled into the server it would lose track of its own binary.
 */
export async function bundleCheckWorker(outfile: string): Promise<string> {
	const entry = workerSource();
	if (!entry) {
		throw new Error(
			`the check worker is missing: run \`node scripts/build-worker.mjs\` to write ${BUILT_WORKER}`
		);
	}
	const resolved = createRequire(import.meta.url).resolve('esbuild');
	const esbuild = (await import(
		/* @vite-ignore */ pathToFileURL(resolved).href
	)) as typeof import('esbuild') & { default?: typeof import('esbuild') };
	const build = esbuild.build ?? esbuild.default!.build;
	await build(workerBuildOptions(entry, outfile));
	return outfile;
}

let onTheFly: Promise<string> | null = null;

export async function checkWorkerFile(): Promise<string> {
	const override = process.env.RANKSEAL_CHECK_WORKER;
	if (override) {
		const file = path.resolve(override);
		if (!existsSync(file))
			throw new Error(`RANKSEAL_CHECK_WORKER names ${file}, which does not exist`);
		return file;
	}
	const built = path.resolve(BUILT_WORKER);
	if (existsSync(built)) return built;
	onTheFly ??= (async () => {
		const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-worker-'));
		process.once('exit', () => rmSync(folder, { recursive: true, force: true }));
		return bundleCheckWorker(path.join(folder, 'check-worker.mjs'));
	})();
	return onTheFly;
}
