/**
 * rankseal verify: checks an evidence bundle as downloaded, without unzipping it.
 *   npm run --silent verify -- BUNDLE.zip [--keys keys.json]
 * Same checks and output as the bundle's own verify.mjs. Exit 0 valid, 1 not.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { verifyEvidence } from '../lib/evidence/verify';
import { readZip } from '../lib/server/evidence/zip-read';
import { reportLines, trustedKeyIds } from './verify-report';

function main(): number {
	const { values, positionals } = parseArgs({
		options: { keys: { type: 'string' } },
		allowPositionals: true
	});
	if (positionals.length !== 1) {
		console.error('usage: npm run --silent verify -- BUNDLE.zip [--keys keys.json]');
		return 1;
	}
	const files = readZip(readFileSync(positionals[0]));
	const report = verifyEvidence(files, { trustedKeyIds: trustedKeyIds(values.keys) });
	console.log(reportLines(report).join('\n'));
	return report.valid ? 0 : 1;
}

try {
	process.exitCode = main();
} catch (error) {
	console.log(`FAIL: ${(error as Error).message}`);
	process.exitCode = 1;
}
