/** The people a certificate's DOI names as creators, and their ORCID iDs where an account has one. */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DoiCreator } from '../db/models/CertificateDoi';
import { orcidForAccount } from '../accounts/orcid-links';
import { claimAuthors } from './certificate-authors';

/** The claim's creator first, then the group's members: the PDF's author order. */
export async function authorsOf(
	database: Database,
	claim: Pick<ClaimAttributes, 'createdBy' | 'groupId'>,
	transaction?: Transaction
): Promise<DoiCreator[]> {
	const authors = await claimAuthors(database, claim, transaction);
	return authors.map(({ userId, name }) => ({ userId, name }));
}

/** The account's ORCID iD as it is now (0000-0002-1825-0097 form), or null. */
export async function orcidOf(database: Database, userId: string | null): Promise<string | null> {
	return userId ? orcidForAccount(database, userId) : null;
}
