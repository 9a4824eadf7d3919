/** The people a certificate's DOI names as creators, and their ORCID iDs where an account has one. */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DoiCreator } from '../db/models/CertificateDoi';

/** The claim's creator first, then the group's members: the PDF's author order. */
export async function authorsOf(
	database: Database,
	claim: Pick<ClaimAttributes, 'createdBy' | 'groupId'>,
	transaction?: Transaction
): Promise<DoiCreator[]> {
	const { Membership, User } = database.models;
	const members = await Membership.findAll({ where: { groupId: claim.groupId }, transaction });
	const ids = [...new Set([claim.createdBy, ...members.map((m) => m.get('userId') as string)])];
	const users = await User.findAll({ where: { id: ids }, transaction });
	const nameOf = new Map(users.map((u) => [u.get('id') as string, u.get('name') as string]));
	return ids.filter((id) => nameOf.has(id)).map((id) => ({ userId: id, name: nameOf.get(id)! }));
}

/** Attribute names an account's ORCID iD may have (the ORCID sign-in work adds one, migration 0022). */
const ORCID_ATTRIBUTES = ['orcid', 'orcidId'];

/**
 * The account's ORCID iD (0000-0002-1825-0097 form), or null: also null while accounts have no
 * such column yet, so DOIs are minted with names alone until ORCID sign-in lands.
 */
export async function orcidOf(database: Database, userId: string | null): Promise<string | null> {
	if (!userId) return null;
	const attributes = database.models.User.getAttributes() as Record<string, unknown>;
	const column = ORCID_ATTRIBUTES.find((name) => name in attributes);
	if (!column) return null;
	const row = await database.models.User.findByPk(userId, { attributes: [column] });
	const value = row?.get(column as 'id');
	return typeof value === 'string' && value ? value.replace(/^https?:\/\/orcid\.org\//, '') : null;
}
