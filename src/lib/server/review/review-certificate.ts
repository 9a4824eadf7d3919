/**
 * Which certificate a review link is about: the one current when the editor made the link (issue
 * 15 §3), so that a certificate issued meanwhile never silently replaces what the referee reviews.
 * Links made before migration 0011 recorded none: they follow the current certificate.
 */
import type { Transaction } from 'sequelize';
import type { RefereeActor } from '../core/actor';
import type { Database } from '../db';
import type { CertificateAttributes } from '../db/models/Certificate';
import { NotFoundError } from '../core/errors';

/** The claim's current (valid, newest) certificate, or null. */
export async function currentCertificateRow(
	database: Database,
	claimId: string,
	transaction?: Transaction
): Promise<CertificateAttributes | null> {
	const row = await database.models.Certificate.findOne({
		where: { claimId, status: 'valid' },
		order: [['issuedAt', 'DESC']],
		transaction
	});
	return (row?.get({ plain: true }) as CertificateAttributes | undefined) ?? null;
}

export interface ReviewedCertificates {
	/** The certificate under review. */
	reviewed: CertificateAttributes;
	/** The claim's current certificate when it is a newer one than the reviewed; else null. */
	newer: CertificateAttributes | null;
}

export async function reviewedCertificates(
	database: Database,
	referee: RefereeActor
): Promise<ReviewedCertificates> {
	const link = await database.models.ReviewLink.findByPk(referee.linkId);
	const current = await currentCertificateRow(database, referee.claimId);
	// With no valid certificate left (withdrawn), the review is over, as it always was.
	if (!current) throw new NotFoundError('No such review link.');
	const id = (link?.get('certificateId') as string | null | undefined) ?? current.id;
	const row = await database.models.Certificate.findByPk(id);
	if (!row) throw new NotFoundError('No such review link.');
	const reviewed = row.get({ plain: true }) as CertificateAttributes;
	return { reviewed, newer: current.id !== reviewed.id ? current : null };
}
