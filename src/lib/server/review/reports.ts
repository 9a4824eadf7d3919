/**
 * Referees' reports: one per review link, editable until submitted; the editor is told when one
 * is filed and releases it to the authors when they choose. Authors never see the link's label.
 */
import { textRule } from '$lib/text-rules';
import { Op } from 'sequelize';
import { z } from 'zod';
import { RECOMMENDATION_MISSING } from '$lib/review/recommendations';
import { booleanFrom, type ValueSource } from '$lib/schema-numbers';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { RECOMMENDATIONS, type ReportAttributes } from '../db/models/Report';
import { mailLink } from '../mail/mail';
import { audit } from '../core/audit';
import { ConflictError, NotFoundError } from '../core/errors';
import { newId } from '../core/ids';
import { sendNotice } from '../mail/notices';
import type { ReportView } from '$lib/views/review';

export type { ReportState, ReportView } from '$lib/views/review';

const reportInput = (source: ValueSource) =>
	z.object({
		recommendation: z.enum(RECOMMENDATIONS, { error: RECOMMENDATION_MISSING[source] }),
		comments: z
			.string()
			.trim()
			.max(50_000, 'Keep the comments under 50 000 characters.')
			.superRefine(textRule('The comments', 'lines')),
		/** false keeps it as a draft; true files it for good. */
		submit:
			source === 'form'
				? z.preprocess((v) => v === true || v === 'true' || v === 'on', z.boolean()).default(true)
				: booleanFrom('submit', 'json').default(true)
	});
export const reportInputSchema = reportInput('form');
/** The API's body: submit as JSON's true or false only. */
export const reportJsonSchema = reportInput('json');
export type ReportInput = z.input<typeof reportInputSchema>;

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

export const reportView = (r: ReportAttributes): ReportView => ({
	id: r.id,
	claimId: r.claimId,
	recommendation: r.recommendation,
	comments: r.comments,
	state: r.releasedAt ? 'released' : r.submittedAt ? 'submitted' : 'draft',
	submittedAt: iso(r.submittedAt),
	releasedAt: iso(r.releasedAt)
});

/** The referee's own report, or null before they write one. */
export async function ownReport(database: Database, actor: Actor): Promise<ReportView | null> {
	if (actor.kind !== 'referee') throw new NotFoundError('No such report.');
	const row = await database.models.Report.findOne({ where: { reviewLinkId: actor.linkId } });
	return row ? reportView(row.get({ plain: true })) : null;
}

/** Saves the referee's report (a draft, or filed); ConflictError once it has been filed. */
export async function saveReport(
	database: Database,
	actor: Actor,
	input: ReportInput | Record<string, unknown>
): Promise<ReportView> {
	if (actor.kind !== 'referee') throw new NotFoundError('No such claim.');
	const claim = await requireClaim(database, actor, actor.claimId, 'file-report');
	const { recommendation, comments, submit } = reportInputSchema.parse(input);
	const { Report } = database.models;
	const id = await writeTransaction(database, async (transaction) => {
		const row = await Report.findOne({ where: { reviewLinkId: actor.linkId }, transaction });
		if (row?.get('submittedAt'))
			throw new ConflictError('This report has been filed and can no longer be changed.');
		const submittedAt = submit ? new Date() : null;
		const id = (row?.get('id') as string | undefined) ?? newId();
		if (row) await row.update({ recommendation, comments, submittedAt }, { transaction });
		else
			await Report.create(
				{
					id,
					reviewLinkId: actor.linkId,
					claimId: claim.id,
					recommendation,
					comments,
					submittedAt
				},
				{ transaction }
			);
		const action = submit ? 'report.filed' : 'report.saved';
		const entry = { actorId: null, groupId: claim.groupId, subjectType: 'report', subjectId: id };
		await audit(
			database,
			{ ...entry, action, details: { reviewLinkId: actor.linkId } },
			transaction
		);
		return id;
	});
	if (submit) await noticeFiled(database, actor.linkId, claim.title, recommendation);
	return reportView((await Report.findByPk(id))!.get({ plain: true }));
}

async function noticeFiled(
	database: Database,
	linkId: string,
	claimTitle: string,
	recommendation: string
) {
	const { ReviewLink, Share, User } = database.models;
	const link = (await ReviewLink.findByPk(linkId))!.get({ plain: true });
	const share = (await Share.findByPk(link.shareId))!.get({ plain: true });
	const editor = await User.findByPk(link.createdBy);
	if (!editor) return;
	await sendNotice(
		{ database },
		{
			template: 'notice-report-filed',
			to: editor.get('email') as string,
			link: mailLink(`/editor#claim-${share.claimId}`),
			words: { claim: claimTitle, manuscript: share.manuscript, recommendation }
		}
	);
}

/** The editor releases a filed report to the authors; each author with an account is told. */
export async function releaseReport(
	database: Database,
	actor: Actor,
	reportId: string
): Promise<ReportView> {
	const { Report, ReviewLink, Share } = database.models;
	const report = (await Report.findByPk(reportId))?.get({ plain: true });
	if (!report) throw new NotFoundError('No such report.');
	const claim = await requireClaim(database, actor, report.claimId, 'review').catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such report.') : problem;
	});
	const link = (await ReviewLink.findByPk(report.reviewLinkId))!.get({ plain: true });
	const share = (await Share.findByPk(link.shareId))!.get({ plain: true });
	if (share.editorId !== accountIdOf(actor)) throw new NotFoundError('No such report.');
	if (!report.submittedAt) throw new ConflictError('The referee has not filed this report yet.');
	if (!report.releasedAt) {
		await writeTransaction(database, async (transaction) => {
			await Report.update({ releasedAt: new Date() }, { where: { id: reportId }, transaction });
			const entry = { actorId: accountIdOf(actor), groupId: claim.groupId, subjectType: 'report' };
			await audit(
				database,
				{ ...entry, subjectId: reportId, action: 'report.released' },
				transaction
			);
		});
		await noticeReleased(database, claim, share, report.recommendation);
	}
	return reportView((await Report.findByPk(reportId))!.get({ plain: true }));
}

async function noticeReleased(
	database: Database,
	claim: { id: string; title: string; createdBy: string },
	share: { journal: string; manuscript: string },
	recommendation: string
) {
	const author = await database.models.User.findByPk(claim.createdBy);
	if (!author) return;
	await sendNotice(
		{ database },
		{
			template: 'notice-report-released',
			to: author.get('email') as string,
			link: mailLink(`/claims/${claim.id}/sharing`),
			words: {
				claim: claim.title,
				journal: share.journal,
				manuscript: share.manuscript,
				recommendation
			}
		}
	);
}

/** Released reports of a claim, for its group's members: no label, no link, no referee. */
export async function releasedReports(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<ReportView[]> {
	await requireClaim(database, actor, claimId, 'share');
	const rows = await database.models.Report.findAll({
		where: { claimId, releasedAt: { [Op.ne]: null } },
		order: [['releasedAt', 'ASC']]
	});
	return rows.map((r) => reportView(r.get({ plain: true })));
}
