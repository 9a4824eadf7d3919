/**
 * The standalone verifier carried in every evidence bundle (bundled into verify.mjs):
 *   node verify.mjs [FOLDER] [--keys keys.json | --key-fingerprint HEX]
 * checks the unzipped bundle in FOLDER (default: the current folder). Exit 0 valid with an
 * anchored key, 1 not valid, 2 a usage mistake, 3 valid but the key is vouched for only by the
 * bundle itself.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import type { EvidenceFiles } from '../lib/evidence/layout';
import { verifyEvidence } from '../lib/evidence/verify';
import {
	EXIT,
	exitStatus,
	keysUrlOf,
	reportLines,
	trustedKeyIds,
	UsageError,
	USAGE_OPTIONS
} from './verify-report';

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
		options: { keys: { type: 'string' }, 'key-fingerprint': { type: 'string' } },
		allowPositionals: true
	});
	const trusted = trustedKeyIds(values);
	const here = path.dirname(fileURLToPath(import.meta.url));
	const folder = positionals[0] ?? (existsSync('manifest.json') ? '.' : here);
	const files = readFolder(folder, values.keys);
	const report = verifyEvidence(files, { trustedKeyIds: trusted });
	console.log(reportLines(report, keysUrlOf(files)).join('\n'));
	return exitStatus(report);
}

try {
	process.exitCode = main();
} catch (error) {
	const usage =
		error instanceof UsageError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS');
	if (usage) {
		console.log(`usage: node verify.mjs [FOLDER] ${USAGE_OPTIONS}\n${(error as Error).message}`);
		process.exitCode = EXIT.usage;
	} else {
		console.log(`FAIL: ${(error as Error).message}`);
		process.exitCode = EXIT.fail;
	}
}
