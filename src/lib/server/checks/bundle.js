// esbuild options for the check worker, shared by scripts/build-worker.mjs and the runner's
// on-the-fly build: one self-contained ES module for Node 20.

/** @param {string} entry @param {string} outfile */
export function workerBuildOptions(entry, outfile) {
	return {
		entryPoints: [entry],
		outfile,
		bundle: true,
		platform: /** @type {const} */ ('node'),
		format: /** @type {const} */ ('esm'),
		target: 'node20',
		// ES module builds first: jsonc-parser's UMD build requires its parts at run time.
		mainFields: ['module', 'main'],
		logLevel: /** @type {const} */ ('warning'),
		// Bundled CommonJS dependencies call require(); give the ES module one.
		banner: {
			js: "import { createRequire as __rankseal_createRequire } from 'node:module'; const require = __rankseal_createRequire(import.meta.url);"
		}
	};
}
