/**
 * Claims: create, list (search, filter, sort, page) and read, always within the user's groups.
 */
import { col, fn, Op, where as sqlWhere, type Order, type WhereOptions } from 'sequelize';
import { claimInputSchema, type ClaimInputValues, type ClaimQuery } from '$lib/claims/schema';
import type { FourierConvention, MethodId } from '$lib/certify';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ClaimAttributes, ClaimState } from '../db/models/Claim';
import type { CheckStatus } from '../db/models/Check';
import { membershipsOf, visibleClaim } from './access';
import { audit } from './audit';
import { ForbiddenError, NotFoundError } from './errors';
import { newId } from './ids';

export type { ClaimInput, ClaimQuery } from '$lib/claims/schema';

export interface LatestCheck {
	id: string;
	status: CheckStatus;
	certifiedSchmidtNumber: number | null;
	verdict: 'supported' | 'not supported' | null;
}

export interface ClaimView {
	id: string;
	groupId: string;
	groupName: string;
	title: string;
	sourceDescription: string;
	dimension: number;
	method: MethodId;
	bases: number[];
	fourier: FourierConvention;
	claimedSchmidtNumber: number;
	manuscriptReference: string | null;
	state: ClaimState;
	createdBy: { id: string; name: string };
	createdAt: string;
	updatedAt: string;
	latestCheck: LatestCheck | null;
}

export interface ClaimPage {
	items: ClaimView[];
	total: number;
	page: number;
	pageSize: number;
}

export const DEFAULT_PAGE_SIZE = 20;

const iso = (value: Date | string | undefined): string => new Date(value ?? 0).toISOString();

/** Views of claim rows, with group and author names and each claim's newest check. */
async function claimViews(database: Database, claims: ClaimAttributes[]): Promise<ClaimView[]> {
	const { Group, User, Check } = database.models;
	const ids = claims.map((c) => c.id);
	const [groups, users, checks] = await Promise.all([
		Group.findAll({ where: { id: [...new Set(claims.map((c) => c.groupId))] } }),
		User.findAll({
			where: { id: [...new Set(claims.map((c) => c.createdBy))] },
			attributes: ['id', 'name']
		}),
		Check.findAll({
			where: { claimId: ids },
			order: [
				['createdAt', 'DESC'],
				[col('rowid'), 'DESC']
			]
		})
	]);
	const groupName = new Map(groups.map((g) => [g.get('id') as string, g.get('name') as string]));
	const userName = new Map(users.map((u) => [u.get('id') as string, u.get('name') as string]));
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
		createdBy: { id: c.createdBy, name: userName.get(c.createdBy) ?? '' },
		createdAt: iso(c.createdAt),
		updatedAt: iso(c.updatedAt),
		latestCheck: latest.get(c.id) ?? null
	}));
}

/** Creates a draft claim in the given group (default: the user's first group). */
export async function createClaim(
	database: Database,
	userId: string,
	input: ClaimInputValues
): Promise<ClaimView> {
	const claim = claimInputSchema.parse(input);
	const memberships = await database.models.Membership.findAll({
		where: { userId },
		order: [
			['createdAt', 'ASC'],
			[col('rowid'), 'ASC']
		]
	});
	if (memberships.length === 0)
		throw new ForbiddenError('Join or create a group before making claims.');
	const groupId = claim.groupId ?? (memberships[0].get('groupId') as string);
	if (!memberships.some((m) => m.get('groupId') === groupId))
		throw new NotFoundError('No such group.');
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
	return (await getClaim(database, userId, id))!;
}

/** One page of the claims of the user's groups, searched, filtered and sorted. */
export async function listClaims(
	database: Database,
	userId: string,
	query: ClaimQuery = {}
): Promise<ClaimPage> {
	const page = Math.max(1, Math.floor(query.page ?? 1));
	const pageSize = Math.min(100, Math.max(1, Math.floor(query.pageSize ?? DEFAULT_PAGE_SIZE)));
	const groupIds = [...(await membershipsOf(database, userId)).keys()];
	const where: WhereOptions = { groupId: { [Op.in]: groupIds } };
	if (query.state) Object.assign(where, { state: query.state });
	if (query.method) Object.assign(where, { method: query.method });
	if (query.q) {
		// instr() rather than LIKE, so that % and _ in the search are plain characters.
		const needle = query.q.toLowerCase();
		const contains = (column: string) =>
			sqlWhere(fn('instr', fn('lower', col(column)), needle), Op.gt, 0);
		Object.assign(where, {
			[Op.or]: ['title', 'source_description', 'manuscript_reference'].map(contains)
		});
	}
	const direction = query.order === 'asc' ? 'ASC' : 'DESC';
	const sort = query.sort ?? 'createdAt';
	const order: Order = [
		sort === 'title' ? [fn('lower', col('title')), direction] : [sort, direction],
		[col('rowid'), direction]
	];
	const { rows, count } = await database.models.Claim.findAndCountAll({
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

/** The claim, or null when it does not exist or belongs to another group. */
export async function getClaim(
	database: Database,
	userId: string,
	claimId: string
): Promise<ClaimView | null> {
	const claim = await visibleClaim(database, userId, claimId);
	return claim ? (await claimViews(database, [claim]))[0] : null;
}

/** The claim's row, or NotFoundError: for services that act on a claim. */
export async function requireVisibleClaim(
	database: Database,
	userId: string,
	claimId: string
): Promise<ClaimAttributes> {
	const claim = await visibleClaim(database, userId, claimId);
	if (!claim) throw new NotFoundError('No such claim.');
	return claim;
}
