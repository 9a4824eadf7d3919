/** Withdrawing a certificate: its status changes and the ledger records why; nothing else does. */
import { InputError } from '../../certify';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { serviceKey } from '../evidence/keys';
import { accountIdOf, isAccount, type Actor } from '../access/actor';
import { roleIn } from '../access/permissions';
import { audit } from './audit';
import { certificateView, type CertificateView } from './certificate-views';
import { ForbiddenError, NotFoundError } from './errors';
import { appendLedger } from './ledger';

/** The group's lead or the certificate's issuer may withdraw it; the reason goes in the ledger. */
export async function withdrawCertificate(
	database: Database,
	actor: Actor,
	certificateId: string,
	reason: string
): Promise<CertificateView> {
	const { Certificate, Claim } = database.models;
	const row = await Certificate.findByPk(certificateId);
	const claim = row && (await Claim.findByPk(row.get('claimId') as string));
	const role =
		claim && isAccount(actor)
			? await roleIn(database, actor, claim.get('groupId') as string)
			: null;
	if (!row || !claim || !role) throw new NotFoundError('No such certificate.');
	const userId = accountIdOf(actor);
	if (role !== 'lead' && row.get('issuedBy') !== userId)
		throw new ForbiddenError('Only the group lead or the issuer may withdraw a certificate.');
	const why = reason.trim();
	if (why.length < 3 || why.length > 500)
		throw new InputError('reason: say why in 3 to 500 characters');
	if (row.get('status') === 'withdrawn')
		throw new InputError('the certificate is withdrawn already');
	const key = serviceKey();
	await writeTransaction(database, async (transaction) => {
		await row.update({ status: 'withdrawn' }, { transaction });
		const details = { reason: why, by: userId };
		await appendLedger(database, { event: 'withdraw', certificateId, details }, key, transaction);
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.get('groupId') as string,
				action: 'certificate.withdrawn',
				subjectType: 'certificate',
				subjectId: certificateId,
				details
			},
			transaction
		);
	});
	return certificateView(row.get({ plain: true }));
}
