/**
 * Review links: an editor's scoped, expiring, revocable way in for one referee to one shared
 * claim. The token (rvw_ + 32 random bytes) is shown once; only its SHA-256 is stored.
 */
import { textRule } from '$lib/text-rules';
import { z } from 'zod';
import { numberFrom, type ValueSource } from '$lib/schema-numbers';
import { accountIdOf, type Actor, type RefereeActor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import { config } from '../core/config';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ReviewLinkAttributes } from '../db/models/ReviewLink';
import { audit } from '../core/audit';
import { currentCertificateRow } from './review-certificate';
import { NotFoundError } from '../core/errors';
import { hashSecret, newId, newSecret } from '../core/ids';
import type { ReviewLinkState, ReviewLinkView } from '$lib/views/review';

export type { ReviewLinkState, ReviewLinkView } from '$lib/views/review';

export const REVIEW_LINK_DEFAULT_DAYS = 30;
export const REVIEW_LINK_MAX_DAYS = 180;
const DAY_MS = 24 * 60 * 60 * 1000;

const reviewLinkInput = (source: ValueSource) =>
	z.object({
		label: z.preprocess(
			(v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
			z
				.string()
				.trim()
				.max(200, 'Keep the label under 200 characters.')
				.superRefine(textRule('The label', 'line'))
				.optional()
		),
		expiresInDays: z.preprocess(
			(v) => (source === 'form' && (v === '' || v === null) ? undefined : v),
			numberFrom('Days', source)
				.int('Days must be a whole number.')
				.min(1, 'A link lasts at least 1 day.')
				.max(REVIEW_LINK_MAX_DAYS, `A link lasts at most ${REVIEW_LINK_MAX_DAYS} days.`)
				.optional()
		)
	});
export const reviewLinkInputSchema = reviewLinkInput('form');
/** The API's body: the days as a JSON number, never as text. */
export const reviewLinkJsonSchema = reviewLinkInput('json');
export type ReviewLinkInput = z.input<typeof reviewLinkInputSchema>;

const TOKEN_SHAPE = /^rvw_[\w-]{43}$/;

export const reviewPath = (token: string) => `/review/${token}`;

export function linkState(link: ReviewLinkAttributes, now = new Date()): ReviewLinkState {
	if (link.revokedAt) return 'revoked';
	return new Date(link.expiresAt) <= now ? 'expired' : 'active';
}

export const reviewLinkView = (l: ReviewLinkAttributes): ReviewLinkView => ({
	id: l.id,
	claimId: l.claimId,
	label: l.label,
	state: linkState(l),
	expiresAt: new Date(l.expiresAt).toISOString(),
	createdAt: new Date(l.createdAt!).toISOString()
});

/** The editor's open share of the claim (the 'review' permission already held). */
async function editorShare(database: Database, actor: Actor, claimId: string) {
	const share = await database.models.Share.findOne({
		where: { claimId, editorId: accountIdOf(actor), withdrawnAt: null }
	});
	if (!share) throw new NotFoundError('No such claim.');
	return share.get({ plain: true });
}

/** A new link for one referee; the URL (with its token) is returned this once only. */
export async function createReviewLink(
	database: Database,
	actor: Actor,
	claimId: string,
	input: ReviewLinkInput = {}
): Promise<{ id: string; url: string; expiresAt: string }> {
	const { label, expiresInDays } = reviewLinkInputSchema.parse(input);
	const claim = await requireClaim(database, actor, claimId, 'review');
	const share = await editorShare(database, actor, claimId);
	const { token, hash } = newSecret('rvw_');
	const id = newId();
	const expiresAt = new Date(Date.now() + (expiresInDays ?? REVIEW_LINK_DEFAULT_DAYS) * DAY_MS);
	const createdBy = accountIdOf(actor)!;
	await writeTransaction(database, async (transaction) => {
		await database.models.ReviewLink.create(
			{
				id,
				shareId: share.id,
				claimId,
				tokenHash: hash,
				label: label ?? null,
				expiresAt,
				createdBy,
				// What the referee reviews, even once a newer certificate is issued.
				certificateId: (await currentCertificateRow(database, claimId, transaction))?.id ?? null
			},
			{ transaction }
		);
		// The label names the referee: it stays out of the audit details too.
		const entry = { actorId: createdBy, groupId: claim.groupId, subjectType: 'review-link' };
		await audit(
			database,
			{ ...entry, subjectId: id, action: 'review-link.created', details: { expiresAt } },
			transaction
		);
	});
	const url = new URL(reviewPath(token), config().origin).href;
	return { id, url, expiresAt: expiresAt.toISOString() };
}

/** Revokes a link at once; NotFoundError for a link not made under the editor's share. */
export async function revokeReviewLink(
	database: Database,
	actor: Actor,
	linkId: string
): Promise<ReviewLinkView> {
	const { ReviewLink } = database.models;
	const link = (await ReviewLink.findByPk(linkId))?.get({ plain: true });
	if (!link) throw new NotFoundError('No such review link.');
	const claim = await requireClaim(database, actor, link.claimId, 'review').catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such review link.') : problem;
	});
	const share = await editorShare(database, actor, link.claimId).catch(() => null);
	if (!share || share.id !== link.shareId) throw new NotFoundError('No such review link.');
	await writeTransaction(database, async (transaction) => {
		await ReviewLink.update(
			{ revokedAt: new Date() },
			{ where: { id: linkId, revokedAt: null }, transaction }
		);
		const entry = { actorId: accountIdOf(actor), groupId: claim.groupId };
		await audit(
			database,
			{ ...entry, action: 'review-link.revoked', subjectType: 'review-link', subjectId: linkId },
			transaction
		);
	});
	return reviewLinkView((await ReviewLink.findByPk(linkId))!.get({ plain: true }));
}

/**
 * The referee a token stands for, logging the use; null for a malformed, unknown, expired or
 * revoked token, or a withdrawn share (callers answer all of these alike).
 */
export async function resolveReviewToken(
	database: Database,
	token: string,
	use: { method: string; path: string }
): Promise<RefereeActor | null> {
	if (!TOKEN_SHAPE.test(token)) return null;
	const { ReviewLink, Share } = database.models;
	const link = (await ReviewLink.findOne({ where: { tokenHash: hashSecret(token) } }))?.get({
		plain: true
	});
	if (!link) return null;
	const share = (await Share.findByPk(link.shareId))?.get({ plain: true });
	const state = share?.withdrawnAt ? 'revoked' : linkState(link);
	// Refused uses of a real link are logged too: an editor may want to know.
	const details = { method: use.method, path: use.path.replace(token, 'rvw_…'), state };
	const entry = { actorId: null, subjectType: 'review-link', subjectId: link.id, details };
	await audit(database, { ...entry, action: 'review-link.used' });
	return state === 'active' ? { kind: 'referee', claimId: link.claimId, linkId: link.id } : null;
}
