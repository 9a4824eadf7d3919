/**
 * Correcting a claim before its first check: title, source, manuscript, d, method, bases and
 * the claimed Schmidt number. Once a check has run, the claim is what that check was measured
 * against and stays as it is (ConflictError). Who may edit it: 'edit-claim' in permissions.ts.
 */
import {
	CLAIM_FIELDS,
	claimInputSchema,
	type ClaimInput,
	type ClaimInputValues
} from '$lib/claims/schema';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import { audit } from '../core/audit';
import { getClaim, type ClaimView } from './claims';
import { ConflictError, FieldError } from '../core/errors';

const EDITABLE = CLAIM_FIELDS;

/** The claim as its editing form starts, and whether a check has already fixed it. */
export async function claimForEditing(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<{ claim: ClaimView; checked: boolean }> {
	await requireClaim(database, actor, claimId, 'edit-claim');
	const checked = (await database.models.Check.count({ where: { claimId } })) > 0;
	return { claim: await getClaim(database, actor, claimId), checked };
}

/** Uploaded files were read with the claim's d and convention: those stay until the files go. */
function refuseMismatchedFiles(
	claim: Pick<ClaimAttributes, 'fourier'>,
	values: Pick<ClaimInput, 'dimension' | 'fourier'>,
	datasets: DatasetAttributes[]
): void {
	const other = datasets.find((d) => d.summary.dimension !== values.dimension);
	if (other)
		throw new FieldError(
			'dimension',
			`The uploaded file ${other.originalName} is d = ${other.summary.dimension}; remove it before changing d.`
		);
	if (datasets.length > 0 && values.fourier !== claim.fourier)
		throw new FieldError(
			'fourier',
			`The uploaded file ${datasets[0].originalName} was read with the ${claim.fourier} convention; remove it before changing the convention.`
		);
}

export async function updateClaim(
	database: Database,
	actor: Actor,
	claimId: string,
	input: ClaimInputValues | Record<string, string>
): Promise<ClaimView> {
	const stored = await requireClaim(database, actor, claimId, 'edit-claim');
	const userId = accountIdOf(actor);
	// The trials mode and probabilities stay as made; the edit is checked against them.
	const { trialsMode, trialsProbabilities } = stored;
	// So does a declared target (as declared, so a scaled one is scaled and reported again).
	// A target from a calibration run stays so; λ fitted from it is checked against d below.
	const fromRun = stored.targetSource === 'calibration-run';
	const target = fromRun ? undefined : (stored.targetDeclared ?? stored.target);
	const values = claimInputSchema.parse({
		...input,
		groupId: undefined,
		trialsMode,
		trialsProbabilities,
		target,
		targetFrom: stored.targetSource ?? undefined
	});
	if (fromRun && stored.target && stored.target.length !== values.dimension)
		throw new FieldError(
			'dimension',
			`λ was fitted on a calibration run in d = ${stored.target.length}; d cannot change now.`
		);
	const { Check, Claim, Dataset } = database.models;
	await writeTransaction(database, async (transaction) => {
		// Re-read inside the write: the role or the claim may have changed since the first look.
		const claim = await requireClaim(database, actor, claimId, 'edit-claim', transaction);
		if (await Check.count({ where: { claimId }, transaction }))
			throw new ConflictError('This claim has been checked; a checked claim is not edited.');
		const datasets = await Dataset.findAll({ where: { claimId }, transaction });
		refuseMismatchedFiles(
			claim,
			values,
			datasets.map((d) => d.get({ plain: true }))
		);
		const changes = Object.fromEntries(EDITABLE.map((key) => [key, values[key]]));
		const before = Object.fromEntries(EDITABLE.map((key) => [key, claim[key]]));
		await Claim.update(changes, { where: { id: claimId }, transaction });
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.groupId,
				action: 'claim.edited',
				subjectType: 'claim',
				subjectId: claimId,
				details: { before, after: changes }
			},
			transaction
		);
	});
	return getClaim(database, actor, claimId);
}
