/**
 * λ from a separate calibration run (witnesses.md §4.3′, §9): a fidelity-target claim made with
 * `targetFrom: 'calibration-run'` takes one run before its first check; the run is fitted on the
 * work pool, refused when it is one of the claim's counts files, and λ is frozen on the claim with
 * the run's bytes, SHA-256 and fit. Every refusal names the field `targetRun`.
 */
import { readFile } from 'node:fs/promises';
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify/counts';
import { TARGET_RUN_FIELD } from '$lib/claims/target';
import { sha256Hex } from '$lib/evidence/hash';
import { tidyFileName } from '$lib/text-rules';
import type { ClaimView } from '$lib/views/claims';
import { requireClaim } from '../access/permissions';
import { engineTasks } from '../checks/registry';
import { accountIdOf, type Actor } from '../core/actor';
import { audit } from '../core/audit';
import { ConflictError } from '../core/errors';
import { FieldError } from '../core/field-error';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import { writeTransaction } from '../db/transactions';
import { datasetFilePath } from '../storage/counts-store';
import { getClaim } from './claims';

const refuse = (message: string) => new FieldError(TARGET_RUN_FIELD, message);

/** The claim must wait for a run, and have none yet (λ is frozen by the first). */
function requireAwaitingRun(claim: ClaimAttributes): void {
	if (claim.method !== 'fidelity-target' || claim.targetSource !== 'calibration-run')
		throw refuse('This claim declares its target λ; it takes no calibration run.');
	if (claim.targetRunSha256)
		throw new ConflictError(
			`λ is frozen: it was fitted on the calibration run ${claim.targetRunName} (SHA-256 ${claim.targetRunSha256.slice(0, 12)}…); a claim takes one run.`
		);
}

async function countsFilesOf(database: Database, claimId: string) {
	const rows = await database.models.Dataset.findAll({ where: { claimId } });
	return Promise.all(
		rows.map(async (row) => {
			const { sha256, originalName } = row.get({ plain: true });
			return { sha256, name: originalName, bytes: await readFile(datasetFilePath(sha256)) };
		})
	);
}

export async function addTargetRun(
	database: Database,
	actor: Actor,
	claimId: string,
	upload: { bytes: Uint8Array; originalName: string }
): Promise<ClaimView> {
	const claim = await requireClaim(database, actor, claimId, 'add-dataset');
	requireAwaitingRun(claim);
	const { bytes } = upload;
	if (bytes.byteLength === 0) throw refuse('Choose the calibration run’s counts file.');
	if (bytes.byteLength > MAX_COUNTS_FILE_BYTES)
		throw refuse(`The calibration run is larger than the limit of ${MAX_COUNTS_FILE_BYTES} bytes.`);
	const run = { bytes, sha256: sha256Hex(bytes) };
	const userId = accountIdOf(actor)!;
	const counts = await countsFilesOf(database, claimId);
	const runner = await engineTasks(database);
	const outcome = await runner.fitTargetRun(
		{ run, dimension: claim.dimension, counts },
		`upload:${userId}`
	);
	if (!outcome.ok) throw refuse(outcome.message);
	const { fit } = outcome;
	const name = tidyFileName(upload.originalName, 'calibration-run');
	await writeTransaction(database, async (transaction) => {
		// Re-read inside the write: another run may have frozen λ meanwhile.
		requireAwaitingRun(await requireClaim(database, actor, claimId, 'add-dataset', transaction));
		const frozen = {
			target: fit.coefficients,
			targetDeclared: null,
			targetRun: Buffer.from(bytes),
			targetRunSha256: run.sha256,
			targetRunName: name,
			targetFit: { method: fit.method, diagonal: fit.diagonal }
		};
		const row = await database.models.Claim.findByPk(claimId, { transaction });
		await row!.update(frozen, { transaction });
		const details = { sha256: run.sha256, name, coefficients: fit.coefficients };
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.groupId,
				action: 'claim.target-fitted',
				subjectType: 'claim',
				subjectId: claimId,
				details
			},
			transaction
		);
	});
	return getClaim(database, actor, claimId);
}
