/**
 * The record of every analysis the group ran on one counts file (issue 15): each check on the
 * same counts in any of the group's claims, with its settings, seed, who ran it and when.
 * Members only ('read-analyses'): it names the group's other claims.
 */
import { distinctAnalyses, analysisRuns, countsSha256Of } from '../checks/analyses';
import { requireClaim } from '../access/permissions';
import type { Actor } from '../core/actor';
import type { Database } from '../db';
import { NotFoundError } from '../core/errors';
import type { CountsRecord } from '$lib/views/datasets';

export type { CountsRecord } from '$lib/views/datasets';

export async function countsRecord(
	database: Database,
	actor: Actor,
	datasetId: string
): Promise<CountsRecord> {
	const row = await database.models.Dataset.findByPk(datasetId);
	if (!row) throw new NotFoundError('No such dataset.');
	const dataset = row.get({ plain: true });
	const claim = await requireClaim(database, actor, dataset.claimId, 'read-analyses');
	const countsSha256 = await countsSha256Of(database, dataset);
	const runs = await analysisRuns(database, claim.groupId, countsSha256);
	const { Claim, User } = database.models;
	const people = await User.findAll({ where: { id: runs.flatMap((r) => r.ranBy ?? []) } });
	const claims = await Claim.findAll({
		where: { id: runs.map((r) => r.claimId) },
		attributes: ['id', 'title']
	});
	const name = new Map(people.map((u) => [u.get('id') as string, u.get('name') as string]));
	const title = new Map(claims.map((c) => [c.get('id') as string, c.get('title') as string]));
	return {
		countsSha256,
		distinct: distinctAnalyses(runs).length,
		runs: runs.map((r) => ({
			...r,
			ranByName: (r.ranBy && name.get(r.ranBy)) || 'a removed account',
			claimTitle: title.get(r.claimId) ?? ''
		}))
	};
}
