/** The verifiers' shared output: what was checked, then PASS or FAIL naming the first failed item. */
import { readFileSync } from 'node:fs';
import { keyIdsOfList } from '../lib/evidence/layout';
import type { VerificationReport } from '../lib/evidence/verify';

export function reportLines(report: VerificationReport): string[] {
	const lines = [
		`certificate  ${report.certificateId ?? '(unknown)'}`,
		`fingerprint  ${report.fingerprint ?? '(unknown)'}`,
		`signing key  ${report.keyId ?? '(unknown)'}`
	];
	if (report.valid) lines.push(`PASS: ${report.message} (${report.passed.length} items checked).`);
	else lines.push(`FAIL at ${report.failedItem}: ${report.message}.`);
	return lines;
}

/** Key ids from a saved copy of the service's published key list (--keys FILE). */
export function trustedKeyIds(file: string | undefined): string[] | undefined {
	if (!file) return undefined;
	const ids = keyIdsOfList(readFileSync(file, 'utf8'));
	if (!ids) throw new Error(`${file} is not a list of published keys ({ "keys": [{ "id": … }] })`);
	return ids;
}
