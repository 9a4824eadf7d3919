/**
 * The record of every analysis of one counts file in a group (issue 15): the same counts uploaded
 * to several claims are one file, matched by the SHA-256 of their canonical form. A certificate
 * counts the distinct analyses run up to it; referee re-runs are the referee's and never count.
 */
import { readFile } from 'node:fs/promises';
import { col, Op, type Transaction } from 'sequelize';
import { InputError } from '$lib/certify';
import {
	analysisKey,
	derivedSeed,
	seedChoice,
	type AnalysisEntry,
	type AnalysisSettings,
	type EvidenceAnalyses
} from '$lib/evidence/analyses';
import { engineTasks } from '../checks/registry';
import type { Database } from '../db';
import type { CheckAttributes } from '../db/models/Check';
import { CLAIM_WITHOUT_RUN, type ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import { datasetFilePath } from '../storage/counts-store';
import type { AnalysisRun } from '$lib/views/datasets';

export type { AnalysisRun } from '$lib/views/datasets';

type ClaimSettings = Pick<ClaimAttributes, 'method' | 'bases' | 'fourier'> &
	Partial<Pick<ClaimAttributes, 'target'>>;
type CheckSettings = Pick<CheckAttributes, 'confidence' | 'resamples' | 'subtractAccidentals'>;

export const settingsOf = (claim: ClaimSettings, check: CheckSettings): AnalysisSettings => ({
	method: claim.method,
	bases: claim.bases,
	fourier: claim.fourier,
	confidence: check.confidence,
	resamples: check.resamples,
	subtractAccidentals: !!check.subtractAccidentals,
	...(claim.target ? { target: claim.target } : {})
});

/** The counts' canonical SHA-256; rows from before migration 0011 are read once and kept. */
export async function countsSha256Of(
	database: Database,
	dataset: DatasetAttributes
): Promise<string> {
	if (dataset.countsSha256) return dataset.countsSha256;
	const claim = (await database.models.Claim.findByPk(dataset.claimId))!.get({ plain: true });
	const bytes = await readFile(datasetFilePath(dataset.sha256));
	const task = { bytes, dimension: dataset.summary.dimension, method: claim.method, bases: [] };
	const read = await (await engineTasks(database)).summarise({ ...task, fourier: claim.fourier });
	if (!read.ok) throw new InputError(read.message, read.line ?? undefined);
	await database.models.Dataset.update(
		{ countsSha256: read.countsSha256 },
		{ where: { id: dataset.id } }
	);
	return read.countsSha256;
}

/** The seed a check runs with: the one chosen, or one derived from the counts and the settings. */
export async function seedFor(
	database: Database,
	claim: ClaimSettings,
	dataset: DatasetAttributes,
	check: CheckSettings,
	chosen: number | undefined
): Promise<number> {
	if (chosen !== undefined) return chosen;
	return derivedSeed(await countsSha256Of(database, dataset), settingsOf(claim, check));
}

/** The group's datasets holding these counts (legacy rows of the group are read first). */
async function datasetsWithCounts(database: Database, groupId: string, countsSha256: string) {
	const { Claim, Dataset } = database.models;
	const claims = await Claim.findAll({ where: { groupId }, attributes: ['id'] });
	const claimIds = claims.map((c) => c.get('id') as string);
	const legacy = await Dataset.findAll({ where: { claimId: claimIds, countsSha256: null } });
	for (const row of legacy) await countsSha256Of(database, row.get({ plain: true }));
	const rows = await Dataset.findAll({ where: { claimId: claimIds, countsSha256 } });
	return rows.map((r) => r.get({ plain: true }));
}

/** Every check the group's members ran on these counts up to `upTo`, oldest first. */
export async function analysisRuns(
	database: Database,
	groupId: string,
	countsSha256: string,
	upTo: Date = new Date(),
	transaction?: Transaction
): Promise<AnalysisRun[]> {
	const datasets = await datasetsWithCounts(database, groupId, countsSha256);
	const { Check, Claim } = database.models;
	const checks = await Check.findAll({
		where: {
			datasetId: datasets.map((d) => d.id),
			reviewLinkId: null,
			createdAt: { [Op.lte]: upTo }
		},
		order: [
			['createdAt', 'ASC'],
			[col('rowid'), 'ASC']
		],
		transaction
	});
	const claimIds = [...new Set(checks.map((c) => c.get('claimId') as string))];
	const claims = await Claim.findAll({
		attributes: CLAIM_WITHOUT_RUN,
		where: { id: claimIds },
		transaction
	});
	const byId = new Map(claims.map((c) => [c.get('id') as string, c.get({ plain: true })]));
	return checks.map((row) => {
		const check = row.get({ plain: true });
		const settings = settingsOf(byId.get(check.claimId)!, check);
		const seed = Number(check.seed);
		return {
			checkId: check.id,
			claimId: check.claimId,
			settings,
			seed,
			seedChoice: seedChoice(countsSha256, settings, seed),
			ranBy: check.createdBy,
			ranAt: new Date(check.createdAt ?? 0).toISOString()
		};
	});
}

/** The distinct analyses among the runs, each at its first run. */
export function distinctAnalyses(runs: AnalysisRun[]): AnalysisEntry[] {
	const seen = new Map<string, AnalysisEntry>();
	for (const run of runs) {
		const key = analysisKey(run.settings, run.seedChoice);
		if (!seen.has(key))
			seen.set(key, { ...run.settings, seed: run.seedChoice, firstRunAt: run.ranAt });
	}
	return [...seen.values()];
}

/** The claim's declared analysis: its method, bases, convention, and its first check's confidence. */
async function declaredConfidence(database: Database, claimId: string): Promise<number | null> {
	const first = await database.models.Check.findOne({
		where: { claimId, reviewLinkId: null },
		order: [
			['createdAt', 'ASC'],
			[col('rowid'), 'ASC']
		]
	});
	return (first?.get('confidence') as number | undefined) ?? null;
}

/** What a certificate from this check states about the analyses of its counts. */
export async function analysesForCertificate(
	database: Database,
	claim: ClaimAttributes,
	check: CheckAttributes,
	dataset: DatasetAttributes
): Promise<EvidenceAnalyses> {
	const countsSha256 = await countsSha256Of(database, dataset);
	const list = distinctAnalyses(await analysisRuns(database, claim.groupId, countsSha256));
	const declared = (await declaredConfidence(database, claim.id)) === check.confidence;
	return { total: list.length, declared, nominalConfidence: check.confidence, list };
}
