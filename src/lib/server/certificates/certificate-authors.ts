/**
 * A certificate's authors as its PDF names them — the claim's creator first, then the group's
 * members — each with the ORCID iD linked to their account now (null without one). Shown on the
 * certificate page, /seal, the certificate's JSON and (at issue) the PDF.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { CertificateAuthor } from '$lib/views/certificates';

export type { CertificateAuthor } from '$lib/views/certificates';

/** The one author list: the PDF, the pages and the DOI's creators all read it. */
export async function claimAuthors(
	database: Database,
	claim: { createdBy: string; groupId: string },
	transaction?: Transaction
): Promise<(CertificateAuthor & { userId: string })[]> {
	const { Membership, User } = database.models;
	const members = await Membership.findAll({ where: { groupId: claim.groupId }, transaction });
	const ids = [...new Set([claim.createdBy, ...members.map((m) => m.get('userId') as string)])];
	const users = await User.findAll({
		where: { id: ids },
		attributes: ['id', 'name', 'orcid'],
		transaction
	});
	const byId = new Map(users.map((u) => [u.get('id') as string, u.get({ plain: true })]));
	return ids
		.map((id) => byId.get(id))
		.filter((u) => u !== undefined)
		.map((u) => ({ userId: u.id, name: u.name, orcid: u.orcid ?? null }));
}

/** The authors of the claim a certificate belongs to ([] when the certificate or claim is gone). */
export async function certificateAuthors(
	database: Database,
	claimId: string
): Promise<CertificateAuthor[]> {
	const claim = await database.models.Claim.findByPk(claimId, {
		attributes: ['createdBy', 'groupId']
	});
	if (!claim) return [];
	const authors = await claimAuthors(database, claim.get({ plain: true }));
	return authors.map(({ name, orcid }) => ({ name, orcid }));
}
