/** Withdrawing a certificate: its status changes and the ledger records why; nothing else does. */
import type { Database } from '../db';
import { serviceKey } from '../evidence/keys';
import { accountIdOf, type Actor } from '../access/actor';
import { requireWithdrawal } from '../access/permissions';
import { audit } from './audit';
import { certificateView, type CertificateView } from './certificate-views';
import { ConflictError, FieldError, NotFoundError } from './errors';
import { appendLedger, ledgerTransaction } from './ledger';

/** The group's lead or the certificate's issuer may withdraw it; the reason goes in the ledger. */
export async function withdrawCertificate(
	database: Database,
	caller: Actor,
	certificateId: string,
	reason: string
): Promise<CertificateView> {
	const row = await database.models.Certificate.findByPk(certificateId);
	if (!row) throw new NotFoundError('No such certificate.');
	const { claimId, issuedBy } = row.get({ plain: true });
	const claim = await requireWithdrawal(database, caller, { claimId, issuedBy }).catch((error) => {
		throw error instanceof NotFoundError ? new NotFoundError('No such certificate.') : error;
	});
	const userId = accountIdOf(caller)!;
	const why = reason.trim();
	if (why.length < 3 || why.length > 500)
		throw new FieldError('reason', 'Say why in 3 to 500 characters.');
	if (row.get('status') === 'withdrawn')
		throw new ConflictError('The certificate is withdrawn already.');
	const key = serviceKey();
	await ledgerTransaction(database, async (transaction) => {
		await row.update({ status: 'withdrawn' }, { transaction });
		const details = { reason: why, by: userId };
		await appendLedger(database, { event: 'withdraw', certificateId, details }, key, transaction);
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.groupId,
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
