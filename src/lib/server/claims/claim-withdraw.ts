/**
 * Withdrawing a claim: the claim says why and when, each of its certificates that is not
 * withdrawn yet gets the ledger's withdraw event (so public verification says withdrawn, with
 * the reason), and the author and leads get a notice — all in one transaction.
 */
import { Op } from 'sequelize';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { serviceKey } from '../evidence/keys';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import { audit } from '../core/audit';
import { withdrawalReason, withdrawInTransaction } from '../certificates/certificate-withdraw';
import { queueWithdrawalNotice } from '../mail/claim-notices';
import { ConflictError } from '../core/errors';
import { publishCheckpoint } from '../ledger/ledger-checkpoint';

/** A lead of the claim's group or the claim's author may withdraw it; returns the certificates withdrawn. */
export async function withdrawClaim(
	database: Database,
	actor: Actor,
	claimId: string,
	reason: string
): Promise<{ withdrawnCertificates: string[] }> {
	const { Certificate, Claim, User } = database.models;
	const claim = await requireClaim(database, actor, claimId, 'withdraw-claim');
	const userId = accountIdOf(actor);
	const why = withdrawalReason(reason);
	const key = serviceKey();
	const by = ((await User.findByPk(userId!))?.get('name') as string | undefined) ?? 'A member';
	const done = await writeTransaction(database, async (transaction) => {
		// Read again inside the transaction: a second withdrawal meanwhile must not run twice.
		const current = (await Claim.findByPk(claimId, { transaction }))!;
		if (current.get('state') === 'withdrawn')
			throw new ConflictError('This claim is withdrawn already.');
		const withdrawal = {
			state: 'withdrawn' as const,
			withdrawnReason: why,
			withdrawnAt: new Date()
		};
		await current.update(withdrawal, { transaction });
		const certificates = await Certificate.findAll({
			where: { claimId, status: { [Op.ne]: 'withdrawn' } },
			transaction
		});
		const context = { userId, groupId: claim.groupId, reason: why, key };
		for (const certificate of certificates)
			await withdrawInTransaction(
				database,
				{ id: certificate.get('id') as string },
				context,
				transaction
			);
		const entry = {
			actorId: userId,
			groupId: claim.groupId,
			subjectType: 'claim',
			subjectId: claimId
		};
		await audit(
			database,
			{ ...entry, action: 'claim.withdrawn', details: { reason: why } },
			transaction
		);
		await queueWithdrawalNotice(database, claimId, by, why, transaction);
		return { withdrawnCertificates: certificates.map((c) => c.get('id') as string) };
	});
	await publishCheckpoint(database);
	return done;
}
