/**
 * Correcting a claim before its first check: title, source, manuscript, d, method, bases and
 * the claimed Schmidt number. Once a check has run, the claim is what that check was measured
 * against and stays as it is (ConflictError). Its author and the group's leads may edit it.
 */
import { claimInputSchema, type ClaimInputValues } from '$lib/claims/schema';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { membershipsOf } from './access';
import { audit } from './audit';
import { getClaim, requireVisibleClaim, type ClaimView } from './claims';
import { ConflictError, ForbiddenError } from './errors';
import { FieldError } from './field-error';

const EDITABLE = [
	'title',
	'sourceDescription',
	'dimension',
	'method',
	'bases',
	'claimedSchmidtNumber',
	'manuscriptReference'
] as const;

export async function updateClaim(
	database: Database,
	userId: string,
	claimId: string,
	input: ClaimInputValues
): Promise<ClaimView> {
	const claim = await requireVisibleClaim(database, userId, claimId);
	const role = (await membershipsOf(database, userId)).get(claim.groupId);
	if (claim.createdBy !== userId && role !== 'lead')
		throw new ForbiddenError('Only the claim’s author or a group lead may edit it.');
	const values = claimInputSchema.parse({ ...input, groupId: undefined });
	const { Check, Claim, Dataset } = database.models;
	await writeTransaction(database, async (transaction) => {
		if (await Check.count({ where: { claimId }, transaction }))
			throw new ConflictError('This claim has been checked; a checked claim is not edited.');
		const datasets = await Dataset.findAll({ where: { claimId }, transaction });
		const other = datasets.find(
			(d) => d.get({ plain: true }).summary.dimension !== values.dimension
		);
		if (other)
			throw new FieldError(
				'dimension',
				`The uploaded file ${other.get('originalName')} is d = ${other.get({ plain: true }).summary.dimension}; remove it before changing d.`
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
	return (await getClaim(database, userId, claimId))!;
}
