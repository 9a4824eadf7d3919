/** Withdrawing a certificate: its status changes and the ledger records why; nothing else does. */
import type { Transaction } from 'sequelize';
import { InputError } from '../../certify';
import type { SigningKey } from '../../evidence/signing';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { CertificateAttributes } from '../db/models/Certificate';
import { serviceKey } from '../evidence/keys';
import { accountIdOf, isAccount, type Actor } from '../access/actor';
import { roleIn } from '../access/permissions';
import { audit } from './audit';
import { certificateView, type CertificateView } from './certificate-views';
import { ForbiddenError, NotFoundError } from './errors';
import { appendLedger } from './ledger';

export const WITHDRAW_REASON = { min: 3, max: 500 };

/** The reason, trimmed; InputError naming the field when it is too short or too long. */
export function withdrawalReason(reason: string): string {
	const why = reason.trim();
	if (why.length < WITHDRAW_REASON.min || why.length > WITHDRAW_REASON.max)
		throw new InputError(
			`reason: say why in ${WITHDRAW_REASON.min} to ${WITHDRAW_REASON.max} characters`
		);
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
	const details = { reason, by: userId };
	await appendLedger(database, { event: 'withdraw', certificateId, details }, key, transaction);
	const entry = { actorId: userId, groupId, subjectType: 'certificate', subjectId: certificateId };
	await audit(database, { ...entry, action: 'certificate.withdrawn', details }, transaction);
}

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
	const why = withdrawalReason(reason);
	if (row.get('status') === 'withdrawn')
		throw new InputError('the certificate is withdrawn already');
	const key = serviceKey();
	const groupId = claim.get('groupId') as string;
	await writeTransaction(database, (transaction) =>
		withdrawInTransaction(
			database,
			{ id: certificateId },
			{ userId, groupId, reason: why, key },
			transaction
		)
	);
	await row.reload();
	return certificateView(row.get({ plain: true }));
}
