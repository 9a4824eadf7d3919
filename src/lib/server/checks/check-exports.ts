/**
 * Taking a check's result away: its result as JSON, the counts file exactly as stored (with its
 * SHA-256), as the claim's members may see them; $lib/evidence/command-line.ts words the command.
 */
import { readFile } from 'node:fs/promises';
import type { CertificationResult } from '$lib/certify';
import { sha256Hex } from '$lib/evidence/hash';
import type { Actor } from '../core/actor';
import type { Database } from '../db';
import { getCheck } from './checks';
import { getDataset } from '../datasets/datasets';
import { datasetFilePath } from '../storage/counts-store';
import { ConflictError, NotFoundError } from '../core/errors';

/** The check when it belongs to the claim (another claim's address hides it, so ids do not leak). */
async function checkOfClaim(database: Database, caller: Actor, claimId: string, checkId: string) {
	const check = await getCheck(database, caller, checkId);
	if (check.claimId !== claimId) throw new NotFoundError('No such check.');
	return check;
}

/** The finished check's result; ConflictError while it is queued, running or failed. */
export async function checkResult(
	database: Database,
	caller: Actor,
	claimId: string,
	checkId: string
): Promise<CertificationResult> {
	const check = await checkOfClaim(database, caller, claimId, checkId);
	if (check.status !== 'done' || !check.result)
		throw new ConflictError('The check has no result yet.');
	return check.result;
}

/** The counts file the check ran on, byte for byte as uploaded. */
export async function checkCountsFile(
	database: Database,
	caller: Actor,
	claimId: string,
	checkId: string
) {
	const check = await checkOfClaim(database, caller, claimId, checkId);
	const dataset = await getDataset(database, caller, check.datasetId);
	const bytes = await readFile(datasetFilePath(dataset.sha256));
	if (sha256Hex(bytes) !== dataset.sha256)
		throw new Error(`stored counts file ${dataset.sha256} no longer matches its SHA-256`);
	const contentType = dataset.format === 'json' ? 'application/json' : 'text/csv';
	return { bytes, name: dataset.originalName, sha256: dataset.sha256, contentType };
}
