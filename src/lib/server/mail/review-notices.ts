/**
 * Issue 15 §3: a certificate issued while review links of the claim are open tells each editor
 * who made one, in the issue's own transaction (the notice exists exactly when the certificate does).
 */
import { Op, type Transaction } from 'sequelize';
import type { Database } from '../db';
import { mailLink } from './mail';
import { sendNotice } from './notices';

export async function queueReviewNotices(
	database: Database,
	claimId: string,
	issuedId: string,
	transaction: Transaction
): Promise<void> {
	const { Claim, ReviewLink, Share, User } = database.models;
	const links = await ReviewLink.findAll({
		where: { claimId, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
		transaction
	});
	const claim = (await Claim.findByPk(claimId, { transaction }))!;
	const told = new Set<string>();
	for (const row of links) {
		const link = row.get({ plain: true });
		if (told.has(link.createdBy)) continue;
		told.add(link.createdBy);
		const editor = await User.findByPk(link.createdBy, { transaction });
		const share = await Share.findByPk(link.shareId, { transaction });
		if (!editor || !share) continue;
		const words = {
			claim: claim.get('title') as string,
			manuscript: share.get('manuscript') as string,
			issued: issuedId,
			reviewed: link.certificateId ?? 'the one current when the link was made'
		};
		await sendNotice(
			{ database, transaction },
			{
				template: 'notice-certificate-under-review',
				to: editor.get('email') as string,
				link: mailLink(`/editor#claim-${claimId}`),
				words
			}
		);
	}
}
