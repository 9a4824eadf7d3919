/**
 * rankseal verify: checks evidence bundles as downloaded, without unzipping them.
 *   npm run --silent verify -- BUNDLE.zip [MORE.zip …] [--keys keys.json | --key-fingerprint HEX]
 * Same checks and report as the bundle's own verify.mjs (one report per bundle, each headed by
 * its file name when there are several). Exit 0 when every bundle is valid and its key anchored,
 * 1 when any is not valid, 2 for a usage mistake, 3 when all are valid but some key is vouched
 * for only by its own bundle.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { verifyEvidence } from '../lib/evidence/verify';
import { readZip } from '../lib/server/evidence/zip-read';
import {
	EXIT,
	exitStatus,
	keysUrlOf,
	reportLines,
	trustedKeyIds,
	UsageError,
	USAGE_OPTIONS
} from './verify-report';

function verifyZip(
	file: string,
	trusted: string[] | undefined
): { status: number; lines: string[] } {
	try {
		const files = readZip(readFileSync(file));
		const report = verifyEvidence(files, { trustedKeyIds: trusted });
		return { status: exitStatus(report), lines: reportLines(report, keysUrlOf(files)) };
	} catch (error) {
		return { status: EXIT.fail, lines: [`FAIL: ${(error as Error).message}`] };
	}
}

/** A failure outweighs a missing anchor, which outweighs a re-run left undone, then a pass. */
const SEVERITY: number[] = [EXIT.pass, EXIT.notRerun, EXIT.unanchored, EXIT.fail];
const worse = (a: number, b: number) => (SEVERITY.indexOf(a) >= SEVERITY.indexOf(b) ? a : b);

function main(): number {
	const { values, positionals } = parseArgs({
		options: { keys: { type: 'string' }, 'key-fingerprint': { type: 'string' } },
		allowPositionals: true
	});
	if (positionals.length === 0) throw new UsageError('name at least one bundle');
	const trusted = trustedKeyIds(values);
	let status: number = EXIT.pass;
	for (const file of positionals) {
		const result = verifyZip(file, trusted);
		if (positionals.length > 1) console.log(`== ${file}`);
		console.log(result.lines.join('\n'));
		status = worse(status, result.status);
	}
	return status;
}

try {
	process.exitCode = main();
} catch (error) {
	const usage =
		error instanceof UsageError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS');
	if (usage) {
		console.error(`usage: npm run --silent verify -- BUNDLE.zip [MORE.zip …] ${USAGE_OPTIONS}`);
		console.error((error as Error).message);
		process.exitCode = EXIT.usage;
	} else {
		console.log(`FAIL: ${(error as Error).message}`);
		process.exitCode = EXIT.fail;
	}
}
