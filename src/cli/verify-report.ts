/**
 * The verifiers' shared output and options: what was checked, then PASS, NOT ANCHORED, NOT RE-RUN
 * (a bundle of another engine version: everything checked but the re-run) or FAIL, and the exit
 * status for each.
 */
import { readFileSync } from 'node:fs';
import { describeCheckpoint } from '../lib/evidence/checkpoint';
import { BUNDLE_FILES, keyIdsOfList, type EvidenceFiles } from '../lib/evidence/layout';
import type { VerificationReport } from '../lib/evidence/verify';

/** Exit statuses of `verify` and `verify.mjs` (README, "Certificates and verification"). */
export const EXIT = { pass: 0, fail: 1, usage: 2, unanchored: 3, notRerun: 4 } as const;

/** A mistake in how the verifier was called (exit 2), as opposed to a bundle that fails. */
export class UsageError extends Error {}

export const USAGE_OPTIONS = '[--keys keys.json | --key-fingerprint HEX]';

export function exitStatus(report: VerificationReport): number {
	if (!report.valid) return EXIT.fail;
	if (!report.anchored) return EXIT.unanchored;
	return report.otherEngine ? EXIT.notRerun : EXIT.pass;
}

/** Where the bundle's README says the service publishes its keys, if it says so. */
export function keysUrlOf(files: EvidenceFiles): string | null {
	const readme = files[BUNDLE_FILES.readme];
	if (!readme) return null;
	const match = /\bat (https?:\/\/\S+?\/api\/v1\/signing-keys)\b/.exec(
		new TextDecoder().decode(readme)
	);
	return match ? match[1] : null;
}

export function reportLines(report: VerificationReport, keysUrl: string | null = null): string[] {
	const lines = [
		`certificate  ${report.certificateId ?? '(unknown)'}`,
		`fingerprint  ${report.fingerprint ?? '(unknown)'}`,
		`signing key  ${report.keyId ?? '(unknown)'}`
	];
	if (report.checkpoint) lines.push(`checkpoint   ${describeCheckpoint(report.checkpoint)}`);
	const checked = `${report.passed.length} items checked`;
	if (!report.valid) lines.push(`FAIL at ${report.failedItem}: ${report.message}.`);
	else if (report.anchored && report.otherEngine)
		lines.push(`NOT RE-RUN: signature valid; ${report.message} (${checked}).`);
	else if (report.anchored) lines.push(`PASS: ${report.message} (${checked}).`);
	else
		lines.push(
			`NOT ANCHORED: signature valid and ${report.message} (${checked}), but only the bundle ` +
				`itself vouches for signing key ${report.keyId}. Compare that key fingerprint with the ` +
				`service's published list (${keysUrl ? `the bundle names ${keysUrl}; make sure that is the service's own address` : 'its /api/v1/signing-keys'}), ` +
				`then run again with --keys FILE (the list saved) or --key-fingerprint HEX.`
		);
	return lines;
}

/** Key ids from a saved copy of the service's published key list (--keys FILE). */
function keyIdsOfFile(file: string): string[] {
	let text: string;
	try {
		text = readFileSync(file, 'utf8');
	} catch (error) {
		throw new UsageError(`--keys ${file}: ${(error as Error).message}`);
	}
	const ids = keyIdsOfList(text);
	if (!ids)
		throw new UsageError(`${file} is not a list of published keys ({ "keys": [{ "id": … }] })`);
	return ids;
}

/** A key fingerprint as printed (64 hex digits, spaces or colons between groups allowed). */
function pinnedFingerprint(hex: string): string {
	const digits = hex.replace(/[\s:]/g, '').toLowerCase();
	if (!/^[0-9a-f]{64}$/.test(digits))
		throw new UsageError(
			'--key-fingerprint wants the 64 hex digits of the signing key id (SHA-256 of the public key)'
		);
	return digits;
}

/** The keys the caller vouches for; undefined when they gave neither option. */
export function trustedKeyIds(options: {
	keys?: string;
	'key-fingerprint'?: string;
}): string[] | undefined {
	const { keys, 'key-fingerprint': pinned } = options;
	if (keys && pinned) throw new UsageError('give --keys or --key-fingerprint, not both');
	if (keys) return keyIdsOfFile(keys);
	if (pinned) return [pinnedFingerprint(pinned)];
	return undefined;
}
