/**
 * The demo's certificates: once its checks have run, each demo claim that its newest check
 * supports gets a certificate issued by the claim's author, so a new user sees a certificate,
 * its PDF and its bundle at once. Claims that have one already are left alone.
 */
import type { CertificationResult } from '$lib/certify';
import { userActor } from '../core/actor';
import { startCheckRunner } from '../checks/registry';
import type { Database } from '../db';
import { issueCertificate } from '../certificates/certificates';
import { DEMO_CLAIMS } from './scenario';

export async function certifyDemoClaims(database: Database): Promise<number> {
	const { Certificate, Check, Claim } = database.models;
	// Waits for the demo's checks, including any an interrupted first start left queued.
	await (await startCheckRunner(database)).idle();
	let issued = 0;
	for (const demo of DEMO_CLAIMS) {
		const claim = (await Claim.findOne({ where: { title: demo.title } }))?.get({ plain: true });
		if (!claim || (await Certificate.count({ where: { claimId: claim.id } })) > 0) continue;
		const check = await Check.findOne({
			where: { claimId: claim.id, status: 'done', reviewLinkId: null },
			order: [['createdAt', 'DESC']]
		});
		const result = check?.get('result') as CertificationResult | null | undefined;
		const author = await userActor(database, claim.createdBy);
		if (!check || result?.claim?.verdict !== 'supported' || !author) continue;
		await issueCertificate(database, author, claim.id, check.get('id') as string);
		issued++;
	}
	return issued;
}
