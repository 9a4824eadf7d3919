/**
 * The standalone verifier carried in every evidence bundle (bundled into verify.mjs):
 *   node verify.mjs [FOLDER] [--keys keys.json]
 * checks the unzipped bundle in FOLDER (default: the current folder). Exit 0 valid, 1 not.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import type { EvidenceFiles } from '../lib/evidence/layout';
import { verifyEvidence } from '../lib/evidence/verify';
import { reportLines, trustedKeyIds } from './verify-report';

/**
 * The bundle's files in the folder. Left out: hidden files (the desktop's own, like .DS_Store)
 * and the key list given with --keys, which the README says to save beside the bundle.
 */
function readFolder(folder: string, keysFile: string | undefined): EvidenceFiles {
	const files: EvidenceFiles = {};
	const keys = keysFile ? path.resolve(keysFile) : null;
	for (const name of readdirSync(folder)) {
		const file = path.join(folder, name);
		if (name.startsWith('.') || path.resolve(file) === keys) continue;
		if (statSync(file).isFile()) files[name] = readFileSync(file);
	}
	return files;
}

function main(): number {
	const { values, positionals } = parseArgs({
		options: { keys: { type: 'string' } },
		allowPositionals: true
	});
	const here = path.dirname(fileURLToPath(import.meta.url));
	const folder = positionals[0] ?? (existsSync('manifest.json') ? '.' : here);
	const report = verifyEvidence(readFolder(folder, values.keys), {
		trustedKeyIds: trustedKeyIds(values.keys)
	});
	console.log(reportLines(report).join('\n'));
	return report.valid ? 0 : 1;
}

try {
	process.exitCode = main();
} catch (error) {
	console.log(`FAIL: ${(error as Error).message}`);
	process.exitCode = 1;
}
