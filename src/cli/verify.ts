/**
 * rankseal verify: checks evidence bundles as downloaded, without unzipping them.
 *   npm run --silent verify -- BUNDLE.zip [MORE.zip …] [--keys keys.json]
 * Same checks and report as the bundle's own verify.mjs (one report per bundle, each headed by
 * its file name when there are several). Exit 0 when every bundle is valid, 1 otherwise.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { verifyEvidence } from '../lib/evidence/verify';
import { readZip } from '../lib/server/evidence/zip-read';
import { reportLines, trustedKeyIds } from './verify-report';

function verifyZip(
	file: string,
	trusted: string[] | undefined
): { valid: boolean; lines: string[] } {
	try {
		const report = verifyEvidence(readZip(readFileSync(file)), { trustedKeyIds: trusted });
		return { valid: report.valid, lines: reportLines(report) };
	} catch (error) {
		return { valid: false, lines: [`FAIL: ${(error as Error).message}`] };
	}
}

function main(): number {
	const { values, positionals } = parseArgs({
		options: { keys: { type: 'string' } },
		allowPositionals: true
	});
	if (positionals.length === 0) {
		console.error('usage: npm run --silent verify -- BUNDLE.zip [MORE.zip …] [--keys keys.json]');
		return 1;
	}
	const trusted = trustedKeyIds(values.keys);
	let valid = true;
	for (const file of positionals) {
		const result = verifyZip(file, trusted);
		if (positionals.length > 1) console.log(`== ${file}`);
		console.log(result.lines.join('\n'));
		valid &&= result.valid;
	}
	return valid ? 0 : 1;
}

try {
	process.exitCode = main();
} catch (error) {
	console.log(`FAIL: ${(error as Error).message}`);
	process.exitCode = 1;
}
