/**
 * The editor's home: every claim shared with them, with its certificates, their review links and
 * the reports (drafts stay the referee's own until filed).
 */
import { Op } from 'sequelize';
import type { Actor } from '../core/actor';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import { CLAIM_WITHOUT_RUN } from '../db/models/Claim';
import { certificateView } from '../certificates/certificate-views';
import { reportView } from './reports';
import { reviewLinkView } from './review-links';
import { shareView } from './shares';
import { doisOf } from '../certificates/doi-view';
import type { SharedClaim } from '$lib/views/review';

export type { SharedClaim } from '$lib/views/review';

async function linksOf(database: Database, shareId: string) {
	const { ReviewLink, Report } = database.models;
	const links = await ReviewLink.findAll({ where: { shareId }, order: [['createdAt', 'ASC']] });
	const reports = await Report.findAll({
		where: {
			reviewLinkId: links.map((l) => l.get('id') as string),
			submittedAt: { [Op.ne]: null }
		}
	});
	const byLink = new Map(
		reports.map((r) => [r.get('reviewLinkId') as string, r.get({ plain: true })])
	);
	return links.map((l) => {
		const report = byLink.get(l.get('id') as string);
		return {
			...reviewLinkView(l.get({ plain: true })),
			report: report ? reportView(report) : null
		};
	});
}

/** The editor's open shares, newest first; an empty list for anyone with none. */
export async function editorHome(database: Database, actor: Actor): Promise<SharedClaim[]> {
	const { userId } = await requireService(database, actor, 'own-account');
	const { Share, Claim, Certificate } = database.models;
	const shares = await Share.findAll({
		where: { editorId: userId, withdrawnAt: null },
		order: [['createdAt', 'DESC']]
	});
	const home: SharedClaim[] = [];
	for (const row of shares) {
		const share = row.get({ plain: true });
		const c = (await Claim.findByPk(share.claimId, { attributes: CLAIM_WITHOUT_RUN }))!.get({
			plain: true
		});
		const certificates = await Certificate.findAll({
			where: { claimId: c.id },
			order: [['issuedAt', 'DESC']]
		});
		const dois = await doisOf(
			database,
			certificates.map((r) => r.get('id') as string)
		);
		home.push({
			share: shareView(share),
			claim: {
				id: c.id,
				title: c.title,
				dimension: c.dimension,
				method: c.method,
				claimedSchmidtNumber: c.claimedSchmidtNumber,
				state: c.state
			},
			certificates: certificates.map((r) =>
				certificateView(r.get({ plain: true }), dois.get(r.get('id') as string))
			),
			links: await linksOf(database, share.id)
		});
	}
	return home;
}
