/**
 * The group archive: every claim of a group with its versions, filtered by state, method,
 * dimension, date and free text. A version is one certificate (a later one supersedes the
 * earlier); a dataset or check newer than the last certificate makes an uncertified next version.
 */
import { Op, col, type WhereOptions } from 'sequelize';
import type { ArchiveFilter } from '$lib/archive/schema';
import type { Database } from '../db';
import { CLAIM_WITHOUT_RUN, type ClaimAttributes } from '../db/models/Claim';
import type { AccountActor, Actor } from '../core/actor';
import { requireGroup, requireService } from '../access/permissions';
import { NotFoundError } from '../core/errors';
import { claimTextWhere } from '../claims/claim-search';

export interface ArchiveVersion {
	version: number;
	/** null for work newer than the last certificate, not certified yet. */
	certificateId: string | null;
	fingerprint: string | null;
	status: 'valid' | 'superseded' | 'withdrawn' | 'uncertified';
	at: string;
	checkId: string | null;
	certifiedSchmidtNumber: number | null;
}

export interface ArchiveClaim {
	id: string;
	title: string;
	state: ClaimAttributes['state'];
	method: ClaimAttributes['method'];
	dimension: number;
	fourier: ClaimAttributes['fourier'];
	claimedSchmidtNumber: number;
	sourceDescription: string;
	manuscriptReference: string | null;
	createdAt: string;
	withdrawnAt: string | null;
	withdrawnReason: string | null;
	versions: ArchiveVersion[];
}

export interface Archive {
	group: { id: string; name: string };
	filter: ArchiveFilter;
	claims: ArchiveClaim[];
}

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);
const ARCHIVE_LIMIT = 5000;

function claimWhere(groupId: string, filter: ArchiveFilter): WhereOptions {
	const where: Record<string | symbol, unknown> = { groupId };
	if (filter.state) where.state = filter.state;
	if (filter.method) where.method = filter.method;
	if (filter.dimension) where.dimension = filter.dimension;
	const created: Record<symbol, Date> = {};
	if (filter.from) created[Op.gte] = new Date(`${filter.from}T00:00:00Z`);
	if (filter.to) created[Op.lt] = new Date(Date.parse(`${filter.to}T00:00:00Z`) + 86_400_000);
	if (filter.from || filter.to) where.createdAt = created;
	return filter.q ? { [Op.and]: [where, claimTextWhere(filter.q)] } : where;
}

type Row = { get(key: string): unknown };

/** Each claim's newest dataset or finished check: the work a next version would certify. */
function latestWorkOf(datasets: Row[], checks: Row[]) {
	const latest = new Map<string, { at: Date; checkId: string | null }>();
	const note = (claimId: string, at: Date, checkId: string | null) => {
		const seen = latest.get(claimId);
		if (!seen || at > seen.at)
			latest.set(claimId, { at, checkId: checkId ?? seen?.checkId ?? null });
	};
	for (const d of datasets) note(d.get('claimId') as string, d.get('createdAt') as Date, null);
	for (const c of checks)
		note(c.get('claimId') as string, c.get('createdAt') as Date, c.get('id') as string);
	return latest;
}

async function versionsOf(database: Database, claimIds: string[]) {
	const { Certificate, Check, Dataset } = database.models;
	const [certificates, checks, datasets] = await Promise.all([
		Certificate.findAll({ where: { claimId: claimIds }, order: [['issuedAt', 'ASC']] }),
		Check.findAll({
			where: { claimId: claimIds, status: 'done', reviewLinkId: null },
			attributes: ['id', 'claimId', 'createdAt']
		}),
		Dataset.findAll({ where: { claimId: claimIds }, attributes: ['claimId', 'createdAt'] })
	]);
	const byClaim = new Map<string, ArchiveVersion[]>(claimIds.map((id) => [id, []]));
	for (const row of certificates) {
		const c = row.get({ plain: true });
		const list = byClaim.get(c.claimId)!;
		const manifest = JSON.parse(c.manifest) as { result: { certifiedSchmidtNumber: number } };
		const { certifiedSchmidtNumber } = manifest.result;
		const at = iso(c.issuedAt)!;
		const version = list.length + 1;
		list.push({
			version,
			certificateId: c.id,
			fingerprint: c.fingerprint,
			status: c.status,
			at,
			checkId: c.checkId,
			certifiedSchmidtNumber
		});
	}
	const latest = latestWorkOf(datasets, checks);
	for (const [claimId, list] of byClaim) {
		const work = latest.get(claimId);
		const last = list.at(-1);
		if (!last || !work || work.at <= new Date(last.at)) continue;
		const next = { version: list.length + 1, certificateId: null, fingerprint: null };
		const at = iso(work.at)!;
		list.push({
			...next,
			status: 'uncertified',
			at,
			checkId: work.checkId,
			certifiedSchmidtNumber: null
		});
	}
	return byClaim;
}

/** The caller's first group by name, for an archive asked for without one. */
async function firstGroupOf(database: Database, actor: AccountActor): Promise<string> {
	const { Group, Membership } = database.models;
	const rows = await Membership.findAll({
		where: { userId: actor.userId },
		include: [{ model: Group, attributes: ['name'] }],
		order: [[Group, 'name', 'ASC']]
	});
	// Left the last group since read-archive was decided: as if the group were gone.
	if (!rows.length) throw new NotFoundError('No such group.');
	return rows[0].get('groupId') as string;
}

/**
 * The archive of one group of the caller's (their first group by name when none is named).
 * ForbiddenError for a caller in no group (an editor, an admin, a newcomer): there is no archive
 * of theirs, and an empty list would hide why.
 */
export async function groupArchive(
	database: Database,
	actor: Actor,
	filter: ArchiveFilter
): Promise<Archive> {
	const account = await requireService(database, actor, 'read-archive');
	const groupId = filter.group ?? (await firstGroupOf(database, account));
	await requireGroup(database, actor, groupId, 'read');
	const group = (await database.models.Group.findByPk(groupId))!;
	const rows = await database.models.Claim.findAll({
		attributes: CLAIM_WITHOUT_RUN,
		where: claimWhere(groupId, filter),
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		],
		limit: ARCHIVE_LIMIT
	});
	const claims = rows.map((r) => r.get({ plain: true }));
	const versions = await versionsOf(
		database,
		claims.map((c) => c.id)
	);
	return {
		group: { id: groupId, name: group.get('name') as string },
		filter: { ...filter, group: groupId },
		claims: claims.map((c) => ({
			id: c.id,
			title: c.title,
			state: c.state,
			method: c.method,
			dimension: c.dimension,
			fourier: c.fourier,
			claimedSchmidtNumber: c.claimedSchmidtNumber,
			sourceDescription: c.sourceDescription,
			manuscriptReference: c.manuscriptReference,
			createdAt: iso(c.createdAt)!,
			withdrawnAt: iso(c.withdrawnAt),
			withdrawnReason: c.withdrawnReason ?? null,
			versions: versions.get(c.id) ?? []
		}))
	};
}
