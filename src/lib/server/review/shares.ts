/**
 * Sharing a certified claim with a journal editor: by address, with the journal and manuscript.
 * The notice's link lets the editor open it (and make an editor's account if they have none).
 */
import { textRule } from '$lib/text-rules';
import { z } from 'zod';
import { EMAIL_MAX_LENGTH } from '$lib/account-limits';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ShareAttributes } from '../db/models/Share';
import { mailLink } from '../mail/mail';
import { audit } from '../core/audit';
import { ConflictError, NotFoundError } from '../core/errors';
import { hashSecret, newId, newSecret } from '../core/ids';
import { sendNotice } from '../mail/notices';
import type { ShareView } from '$lib/views/review';

export const shareInputSchema = z.object({
	email: z
		.string()
		.trim()
		.toLowerCase()
		.email('Enter the editor’s e-mail address.')
		.max(EMAIL_MAX_LENGTH),
	journal: z
		.string()
		.trim()
		.min(1, 'Name the journal.')
		.max(200)
		.superRefine(textRule('The journal', 'line')),
	manuscript: z
		.string()
		.trim()
		.min(1, 'Give the manuscript reference.')
		.max(200)
		.superRefine(textRule('The manuscript reference', 'line'))
});
export type ShareInput = z.input<typeof shareInputSchema>;
export type { ShareView } from '$lib/views/review';

export const shareView = (s: ShareAttributes): ShareView => ({
	id: s.id,
	claimId: s.claimId,
	editorEmail: s.editorEmail,
	journal: s.journal,
	manuscript: s.manuscript,
	opened: !!s.openedAt,
	createdAt: new Date(s.createdAt!).toISOString(),
	withdrawnAt: s.withdrawnAt ? new Date(s.withdrawnAt).toISOString() : null
});

/** The path the notice links to; the token is the only secret in the mail. */
export const sharePath = (token: string) => `/shared/${token}`;

async function requireCertified(database: Database, claimId: string) {
	const valid = await database.models.Certificate.count({ where: { claimId, status: 'valid' } });
	if (!valid) throw new ConflictError('Issue a certificate for this claim before sharing it.');
}

/** Shares the claim and sends the editor a notice; ConflictError for a claim not certified. */
export async function shareClaim(
	database: Database,
	actor: Actor,
	claimId: string,
	input: ShareInput
): Promise<ShareView> {
	const { email, journal, manuscript } = shareInputSchema.parse(input);
	const claim = await requireClaim(database, actor, claimId, 'share');
	await requireCertified(database, claimId);
	const { Share, User, Claim } = database.models;
	const sharedBy = accountIdOf(actor)!;
	const { token, hash } = newSecret('shr_');
	const id = newId();
	await writeTransaction(database, async (transaction) => {
		const editor = await User.findOne({ where: { email, accountRole: 'editor' }, transaction });
		const editorId = (editor?.get('id') as string | undefined) ?? null;
		await Share.create(
			{ id, claimId, editorEmail: email, editorId, journal, manuscript, tokenHash: hash, sharedBy },
			{ transaction }
		);
		// Through the row: a static update trips over the JSON getter of `bases`.
		const row = await Claim.findByPk(claimId, { transaction });
		if (row?.get('state') === 'certified') await row.update({ state: 'shared' }, { transaction });
		const details = { email, journal, manuscript };
		const entry = { actorId: sharedBy, groupId: claim.groupId, details };
		await audit(
			database,
			{ ...entry, action: 'claim.shared', subjectType: 'share', subjectId: id },
			transaction
		);
	});
	const sharer = (await User.findByPk(sharedBy))!.get('name') as string;
	await sendNotice(
		{ database },
		{
			template: 'notice-claim-shared',
			to: email,
			link: mailLink(sharePath(token)),
			words: { sharer, email, journal, manuscript, claim: claim.title }
		}
	);
	return shareView((await Share.findByPk(id))!.get({ plain: true }));
}

/** The claim's shares, for its group's members (editors never see each other's). */
export async function listShares(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<ShareView[]> {
	await requireClaim(database, actor, claimId, 'share');
	const rows = await database.models.Share.findAll({
		where: { claimId },
		order: [['createdAt', 'DESC']]
	});
	return rows.map((r) => shareView(r.get({ plain: true })));
}

/** Withdraws a share: the editor and every referee link of it lose access at once. */
export async function withdrawShare(
	database: Database,
	actor: Actor,
	shareId: string
): Promise<ShareView> {
	const { Share, ReviewLink, Claim } = database.models;
	const found = (await Share.findByPk(shareId))?.get({ plain: true });
	if (!found) throw new NotFoundError('No such share.');
	const claim = await requireClaim(database, actor, found.claimId, 'share').catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such share.') : problem;
	});
	await writeTransaction(database, async (transaction) => {
		const now = new Date();
		await Share.update(
			{ withdrawnAt: now },
			{ where: { id: shareId, withdrawnAt: null }, transaction }
		);
		await ReviewLink.update(
			{ revokedAt: now },
			{ where: { shareId, revokedAt: null }, transaction }
		);
		const open = await Share.count({
			where: { claimId: claim.id, withdrawnAt: null },
			transaction
		});
		const row = await Claim.findByPk(claim.id, { transaction });
		if (!open && row?.get('state') === 'shared')
			await row.update({ state: 'certified' }, { transaction });
		await audit(
			database,
			{
				actorId: accountIdOf(actor),
				groupId: claim.groupId,
				action: 'share.withdrawn',
				subjectType: 'share',
				subjectId: shareId
			},
			transaction
		);
	});
	return shareView((await Share.findByPk(shareId))!.get({ plain: true }));
}

/** The open share a notice's token stands for; null when unknown or withdrawn. */
export async function findShareByToken(
	database: Database,
	token: string
): Promise<ShareAttributes | null> {
	if (!/^shr_[\w-]{43}$/.test(token)) return null;
	const row = await database.models.Share.findOne({ where: { tokenHash: hashSecret(token) } });
	const share = row?.get({ plain: true });
	return share && !share.withdrawnAt ? share : null;
}
