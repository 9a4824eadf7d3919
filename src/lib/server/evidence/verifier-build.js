// esbuild options for the standalone bundle verifier (verify.mjs), shared by
// scripts/build-verifier.mjs and the server's on-the-fly build: one ES module, Node builtins only.
import { workerBuildOptions } from '../checks/bundle.js';

/** @param {string} entry @param {string} outfile */
export function verifierBuildOptions(entry, outfile) {
	return {
		...workerBuildOptions(entry, outfile),
		banner: {
			js: [
				'// Rankseal evidence verifier: run `node verify.mjs` inside an unzipped evidence bundle.',
				'// Built from the Rankseal engine and evidence code; needs Node.js 20+, no network.',
				"import { createRequire as __rankseal_createRequire } from 'node:module'; const require = __rankseal_createRequire(import.meta.url);"
			].join('\n')
		}
	};
}
