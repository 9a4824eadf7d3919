/**
 * Claims: create, list (search, filter, sort, page) and read, always as permissions.ts lets the
 * caller see them.
 */
import { MAX_PAGE } from '$lib/paging';
import { col, fn, Op, type Order, type WhereOptions } from 'sequelize';
import { claimInputSchema, type ClaimInputValues } from '$lib/claims/schema';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { CLAIM_WITHOUT_RUN, type ClaimAttributes } from '../db/models/Claim';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim, requireGroup, visibleClaimsWhere } from '../access/permissions';
import { audit } from '../core/audit';
import { ForbiddenError } from '../core/errors';
import { newId } from '../core/ids';
import { claimTextWhere } from '../claims/claim-search';
import { DEFAULT_SORT, firstOrder, type ClaimQuery } from '$lib/claims/filter';
import type { ClaimPage, ClaimView, LatestCheck } from '$lib/views/claims';

export type { ClaimInput } from '$lib/claims/schema';
export type { ClaimQuery } from '$lib/claims/filter';
export type { ClaimPage, ClaimView, LatestCheck } from '$lib/views/claims';

export const DEFAULT_PAGE_SIZE = 20;

const iso = (value: Date | string | undefined): string => new Date(value ?? 0).toISOString();

/** Each claim's newest check by the authors (referee re-runs are the referee's: never shown). */
async function latestChecks(database: Database, ids: string[]): Promise<Map<string, LatestCheck>> {
	const checks = await database.models.Check.findAll({
		where: { claimId: ids, reviewLinkId: null },
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		]
	});
	const latest = new Map<string, LatestCheck>();
	for (const row of checks) {
		const check = row.get({ plain: true });
		if (latest.has(check.claimId)) continue;
		latest.set(check.claimId, {
			id: check.id,
			status: check.status,
			certifiedSchmidtNumber: check.result?.certifiedSchmidtNumber ?? null,
			verdict: check.result?.claim?.verdict ?? null
		});
	}
	return latest;
}

/** Views of claim rows, with group and author names and each claim's newest check. */
async function claimViews(database: Database, claims: ClaimAttributes[]): Promise<ClaimView[]> {
	const { Group, User } = database.models;
	const ids = claims.map((c) => c.id);
	const [groups, users, latest] = await Promise.all([
		Group.findAll({ where: { id: [...new Set(claims.map((c) => c.groupId))] } }),
		User.findAll({
			where: { id: [...new Set(claims.map((c) => c.createdBy))] },
			attributes: ['id', 'name', 'orcid']
		}),
		latestChecks(database, ids)
	]);
	const groupName = new Map(groups.map((g) => [g.get('id') as string, g.get('name') as string]));
	const userName = new Map(users.map((u) => [u.get('id') as string, u.get('name') as string]));
	const userOrcid = new Map(
		users.map((u) => [u.get('id') as string, (u.get('orcid') as string | null) ?? null])
	);
	return claims.map((c) => ({
		id: c.id,
		groupId: c.groupId,
		groupName: groupName.get(c.groupId) ?? '',
		title: c.title,
		sourceDescription: c.sourceDescription,
		dimension: c.dimension,
		method: c.method,
		bases: c.bases,
		fourier: c.fourier,
		claimedSchmidtNumber: c.claimedSchmidtNumber,
		manuscriptReference: c.manuscriptReference,
		state: c.state,
		withdrawal: c.withdrawnAt ? { reason: c.withdrawnReason ?? '', at: iso(c.withdrawnAt) } : null,
		trials: c.trialsMode
			? { mode: c.trialsMode, probabilities: c.trialsProbabilities ?? null }
			: null,
		target: c.target ? { coefficients: c.target, declared: c.targetDeclared ?? null } : null,
		targetFrom: c.method === 'fidelity-target' ? (c.targetSource ?? 'declared') : null,
		targetRun:
			c.targetRunSha256 && c.targetFit
				? { sha256: c.targetRunSha256, name: c.targetRunName ?? '', diagonal: c.targetFit.diagonal }
				: null,
		createdBy: {
			id: c.createdBy,
			name: userName.get(c.createdBy) ?? '',
			orcid: userOrcid.get(c.createdBy) ?? null
		},
		createdAt: iso(c.createdAt),
		updatedAt: iso(c.updatedAt),
		latestCheck: latest.get(c.id) ?? null
	}));
}

/** The first group the account joined: where a claim goes when none is named. */
async function firstGroupOf(database: Database, actor: Actor): Promise<string> {
	const first = await database.models.Membership.findOne({
		where: { userId: accountIdOf(actor) ?? '' },
		order: [
			['createdAt', 'ASC'],
			[col('rowid'), 'ASC']
		]
	});
	if (!first) throw new ForbiddenError('Join or create a group before making claims.');
	return first.get('groupId') as string;
}

/** Creates a draft claim in the given group (default: the actor's first group). */
export async function createClaim(
	database: Database,
	actor: Actor,
	input: ClaimInputValues
): Promise<ClaimView> {
	const claim = claimInputSchema.parse(input);
	const groupId = claim.groupId ?? (await firstGroupOf(database, actor));
	await requireGroup(database, actor, groupId, 'create-claim');
	const userId = accountIdOf(actor)!;
	const id = newId();
	await writeTransaction(database, async (transaction) => {
		await database.models.Claim.create(
			{
				id,
				groupId,
				createdBy: userId,
				title: claim.title,
				sourceDescription: claim.sourceDescription,
				dimension: claim.dimension,
				method: claim.method,
				bases: claim.bases,
				fourier: claim.fourier,
				claimedSchmidtNumber: claim.claimedSchmidtNumber,
				manuscriptReference: claim.manuscriptReference,
				trialsMode: claim.trialsMode,
				trialsProbabilities: claim.trialsProbabilities,
				target: claim.target,
				targetDeclared: claim.targetDeclared,
				targetSource: claim.targetSource,
				state: 'draft'
			},
			{ transaction }
		);
		await audit(
			database,
			{
				actorId: userId,
				groupId,
				action: 'claim.created',
				subjectType: 'claim',
				subjectId: id,
				details: { title: claim.title }
			},
			transaction
		);
	});
	return getClaim(database, actor, id);
}

/** One page of the claims the actor may see, searched, filtered and sorted. */
export async function listClaims(
	database: Database,
	actor: Actor,
	query: ClaimQuery = {}
): Promise<ClaimPage> {
	const page = Math.min(MAX_PAGE, Math.max(1, Math.floor(query.page ?? 1) || 1));
	const pageSize = Math.min(100, Math.max(1, Math.floor(query.pageSize ?? DEFAULT_PAGE_SIZE)));
	const where: WhereOptions = { [Op.and]: [await visibleClaimsWhere(database, actor)] };
	if (query.state) Object.assign(where, { state: query.state });
	if (query.method) Object.assign(where, { method: query.method });
	if (query.q) Object.assign(where, claimTextWhere(query.q));
	const sort = query.sort ?? DEFAULT_SORT;
	// The same first direction as the page: text columns A→Z, the rest newest or largest first.
	const direction = (query.order ?? firstOrder(sort)) === 'asc' ? 'ASC' : 'DESC';
	const order: Order = [
		sort === 'title' ? [fn('lower', col('title')), direction] : [sort, direction],
		[col('rowid'), direction]
	];
	const { rows, count } = await database.models.Claim.findAndCountAll({
		attributes: CLAIM_WITHOUT_RUN,
		where,
		order,
		limit: pageSize,
		offset: (page - 1) * pageSize
	});
	const items = await claimViews(
		database,
		rows.map((r) => r.get({ plain: true }))
	);
	return { items, total: count, page, pageSize };
}

/** The claim; NotFoundError when it does not exist or the actor may not see it. */
export async function getClaim(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<ClaimView> {
	const claim = await requireClaim(database, actor, claimId, 'read');
	return (await claimViews(database, [claim]))[0];
}
