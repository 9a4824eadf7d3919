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

function readFolder(folder: string): EvidenceFiles {
	const files: EvidenceFiles = {};
	for (const name of readdirSync(folder)) {
		const file = path.join(folder, name);
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
	const report = verifyEvidence(readFolder(folder), { trustedKeyIds: trustedKeyIds(values.keys) });
	console.log(reportLines(report).join('\n'));
	return report.valid ? 0 : 1;
}

try {
	process.exitCode = main();
} catch (error) {
	console.log(`FAIL: ${(error as Error).message}`);
	process.exitCode = 1;
}
