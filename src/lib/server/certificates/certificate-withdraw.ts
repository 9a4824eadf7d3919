/** Withdrawing a certificate: its status changes and the ledger records why; nothing else does. */
import { WITHDRAW_REASON, WITHDRAW_REASON_WORDS } from '$lib/claims/withdrawal';
import { checkedText } from '$lib/text-rules';
import type { Transaction } from 'sequelize';
import type { SigningKey } from '../../evidence/signing';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { CertificateAttributes } from '../db/models/Certificate';
import { serviceKey } from '../evidence/keys';
import { accountIdOf, type Actor } from '../core/actor';
import { requireWithdrawal } from '../access/permissions';
import { audit } from '../core/audit';
import { certificateView, type CertificateView } from './certificate-views';
import { ConflictError, FieldError, NotFoundError } from '../core/errors';
import { appendLedger } from '../ledger/ledger';
import { ledgerRole } from '../ledger/ledger-roles';
import { publishCheckpoint } from '../ledger/ledger-checkpoint';
import { requeueDoi } from '../certificates/doi-outbox';
import { doiOf } from '../certificates/doi-view';

export { WITHDRAW_REASON } from '$lib/claims/withdrawal';

/** The reason, trimmed; FieldError naming the field when it is too short or too long. */
export function withdrawalReason(reason: string): string {
	const { text: why, problem } = checkedText(reason, 'The reason', 'lines');
	if (why.length < WITHDRAW_REASON.min || why.length > WITHDRAW_REASON.max)
		throw new FieldError('reason', WITHDRAW_REASON_WORDS);
	if (problem) throw new FieldError('reason', problem);
	return why;
}

/** Marks one certificate withdrawn, with its ledger event and audit row, in the caller's transaction. */
export async function withdrawInTransaction(
	database: Database,
	certificate: Pick<CertificateAttributes, 'id'>,
	context: { userId: string | null; groupId: string; reason: string; key: SigningKey },
	transaction: Transaction
): Promise<void> {
	const { userId, groupId, reason, key } = context;
	const certificateId = certificate.id;
	await database.models.Certificate.update(
		{ status: 'withdrawn' },
		{ where: { id: certificateId }, transaction }
	);
	// The public ledger names a role; the account stays in the private audit trail.
	const byRole = userId ? await ledgerRole(database, userId, groupId, transaction) : null;
	const details = { reason, byRole };
	await appendLedger(database, { event: 'withdraw', certificateId, details }, key, transaction);
	const entry = { actorId: userId, groupId, subjectType: 'certificate', subjectId: certificateId };
	const action = 'certificate.withdrawn';
	await audit(database, { ...entry, action, details: { ...details, by: userId } }, transaction);
	// The DOI record says so too (sent through the DOI outbox).
	await requeueDoi(database, transaction, certificateId);
}

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
	const why = withdrawalReason(reason);
	if (row.get('status') === 'withdrawn')
		throw new ConflictError('The certificate is withdrawn already.');
	const key = serviceKey();
	const groupId = claim.groupId;
	await writeTransaction(database, (transaction) =>
		withdrawInTransaction(
			database,
			{ id: certificateId },
			{ userId, groupId, reason: why, key },
			transaction
		)
	);
	await publishCheckpoint(database);
	await row.reload();
	return certificateView(row.get({ plain: true }), await doiOf(database, certificateId));
}
