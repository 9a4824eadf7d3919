/** Writes how a check ended: its row, the claim's state and the audit event, in one transaction. */
import type { CertificationResult } from '$lib/certify';
import type { CountsAdvice } from '$lib/certify/planner/check-counts';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { ACTIVE_CHECK_STATUSES, type CheckAttributes } from '../db/models/Check';
import { audit } from '../core/audit';

export interface CheckOutcome {
	startedAt: Date;
	result: CertificationResult | null;
	/** Counts needed for an unsupported claim, simulated after the check (not part of the result). */
	countsAdvice?: CountsAdvice | null;
	failure: string | null;
}

/** Nothing is written when the row left queued/running meanwhile (a cancel won the race). */
export async function recordOutcome(
	database: Database,
	check: CheckAttributes,
	outcome: CheckOutcome
): Promise<void> {
	const { Check, Claim } = database.models;
	const { result, failure, startedAt } = outcome;
	const countsAdvice = outcome.countsAdvice ?? null;
	const done = result !== null && failure === null;
	const finishedAt = new Date();
	await writeTransaction(database, async (transaction) => {
		const [changed] = await Check.update(
			done
				? { status: 'done', progress: 1, result, countsAdvice, error: null, startedAt, finishedAt }
				: { status: 'failed', error: failure, startedAt, finishedAt },
			{ where: { id: check.id, status: ACTIVE_CHECK_STATUSES }, transaction }
		);
		if (!changed) return;
		const claim = await Claim.findByPk(check.claimId, { transaction });
		if (done && claim?.get('state') === 'draft')
			await claim.update({ state: 'checked' }, { transaction });
		const details = done
			? {
					certifiedSchmidtNumber: result.certifiedSchmidtNumber,
					verdict: result.claim?.verdict ?? null
				}
			: { error: failure };
		await audit(
			database,
			{
				actorId: check.createdBy,
				groupId: (claim?.get('groupId') as string) ?? null,
				action: done ? 'check.done' : 'check.failed',
				subjectType: 'check',
				subjectId: check.id,
				details
			},
			transaction
		);
	});
}
