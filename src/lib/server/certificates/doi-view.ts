/** What callers see of a certificate's DOI: the name, where it resolves, and how registration stands. */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { CertificateDoiAttributes } from '../db/models/CertificateDoi';
import type { DoiRegistration } from '$lib/doi-registration';
import { doiLink } from './doi-name';
import type { CertificateDoi } from '$lib/views/certificates';

export type { CertificateDoi } from '$lib/views/certificates';

export function doiView(row: CertificateDoiAttributes): CertificateDoi {
	const registration: DoiRegistration =
		row.status === 'failed'
			? 'failed'
			: row.sentRevision === 0
				? 'pending'
				: row.sentRevision < row.revision
					? 'updating'
					: 'registered';
	return { doi: row.doi, url: doiLink(row.doi), registration };
}

/** The DOIs of these certificates, by certificate id (certificates without one are absent). */
export async function doisOf(
	database: Database,
	ids: string[],
	transaction?: Transaction
): Promise<Map<string, CertificateDoi>> {
	if (!ids.length) return new Map();
	const rows = await database.models.CertificateDoi.findAll({
		where: { certificateId: ids },
		transaction
	});
	return new Map(
		rows.map((r) => [r.get('certificateId') as string, doiView(r.get({ plain: true }))])
	);
}

export const doiOf = async (database: Database, id: string): Promise<CertificateDoi | null> =>
	(await doisOf(database, [id])).get(id) ?? null;
