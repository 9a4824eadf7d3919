/**
 * Finds the standalone verifier for bundles: $RANKSEAL_VERIFIER, else build/evidence/verify.mjs
 * (scripts/build-verifier.mjs, run by `npm run build`), else one bundled now from the source.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { verifierBuildOptions } from './verifier-build.js';

export const BUILT_VERIFIER = 'build/evidence/verify.mjs';
const SOURCE = 'src/cli/verify-folder.ts';

function verifierSource(): string | null {
	const here = path.resolve(
		path.dirname(fileURLToPath(import.meta.url)),
		'../../../cli/verify-folder.ts'
	);
	if (existsSync(here)) return here;
	const fromRoot = path.resolve(SOURCE);
	return existsSync(fromRoot) ? fromRoot : null;
}

/** Bundles the verifier into `outfile` with esbuild (loaded from node_modules at run time). */
export async function bundleVerifier(outfile: string): Promise<string> {
	const entry = verifierSource();
	if (!entry) throw new Error(`the verifier is missing: run \`node scripts/build-verifier.mjs\``);
	const resolved = createRequire(import.meta.url).resolve('esbuild');
	const esbuild = (await import(
		/* @vite-ignore */ pathToFileURL(resolved).href
	)) as typeof import('esbuild') & {
		default?: typeof import('esbuild');
	};
	await (esbuild.build ?? esbuild.default!.build)(verifierBuildOptions(entry, outfile));
	return outfile;
}

let onTheFly: Promise<string> | null = null;

async function verifierFile(): Promise<string> {
	const override = process.env.RANKSEAL_VERIFIER;
	if (override) return path.resolve(override);
	const built = path.resolve(BUILT_VERIFIER);
	if (existsSync(built)) return built;
	onTheFly ??= (async () => {
		const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-verifier-'));
		process.once('exit', () => rmSync(folder, { recursive: true, force: true }));
		return bundleVerifier(path.join(folder, 'verify.mjs'));
	})();
	return onTheFly;
}

/** The bytes of verify.mjs for a bundle. */
export async function verifierBytes(): Promise<Uint8Array> {
	return readFileSync(await verifierFile());
}
