/** Certificates issued before DOIs existed get one at start-up, queued like a new certificate's. */
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ClaimAttributes } from '../db/models/Claim';
import { authorsOf } from './doi-creators';
import { queueDoi } from './doi-outbox';

/** Returns how many were queued. */
export async function queueMissingDois(database: Database): Promise<number> {
	const { Certificate, CertificateDoi, Claim } = database.models;
	const have = new Set(
		(await CertificateDoi.findAll({ attributes: ['certificateId'] })).map(
			(r) => r.get('certificateId') as string
		)
	);
	const missing = (await Certificate.findAll({ attributes: ['id', 'claimId'] }))
		.map((r) => r.get({ plain: true }))
		.filter((c) => !have.has(c.id));
	for (const certificate of missing) {
		const claim = (await Claim.findByPk(certificate.claimId))!.get({ plain: true });
		const creators = await authorsOf(database, claim as ClaimAttributes);
		await writeTransaction(database, (t) => queueDoi(database, t, certificate.id, creators));
	}
	return missing.length;
}
