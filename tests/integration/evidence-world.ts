/**
 * A claim with a finished check in a fresh SQLite file and data folder, for the certificate
 * tests. The check row is written with the engine's real result, as the check runner writes it.
 */
import { readFileSync } from 'node:fs';
import { certify, parseCounts } from '../../src/lib/certify';
import type { Database } from '../../src/lib/server/db';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { newId } from '../../src/lib/server/core/ids';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';
import type { UserActor } from '../../src/lib/server/core/actor';

export interface EvidenceWorld {
	ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
	database: Database;
	lead: UserActor;
	author: UserActor;
	outsider: UserActor;
	claimId: string;
	datasetId: string;
}

export async function evidenceWorld(): Promise<EvidenceWorld> {
	const ctx = await temporaryDatabase();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.ORIGIN = 'https://rankseal.test';
	const database = ctx.database;
	const lake = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	const lead = asUser(await addUser(database, 'Ada Lind', [[lake, 'lead']]));
	const author = asUser(await addUser(database, 'Bo Strand', [[lake, 'author']]));
	const outsider = asUser(await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]));
	const claim = await createClaim(database, author, {
		...claimFields,
		manuscriptReference: 'arXiv:2601.00001'
	});
	const dataset = await addDataset(database, author, claim.id, {
		bytes: bytesOf(countsCsv(5, [0, 1, 2], 40_000, 11)),
		originalName: 'run3.csv'
	});
	return { ctx, database, lead, author, outsider, claimId: claim.id, datasetId: dataset.id };
}

/** A done check with the engine's result for these settings (what the runner stores). */
export async function finishedCheck(
	world: EvidenceWorld,
	seed: number,
	resamples = 400,
	on = { claimId: world.claimId, datasetId: world.datasetId }
) {
	const { database, author } = world;
	const { claimId, datasetId } = on;
	const claim = (await database.models.Claim.findByPk(claimId))!.get({ plain: true });
	const dataset = (await database.models.Dataset.findByPk(datasetId))!.get({ plain: true });
	const bytes = readFileSync(datasetFilePath(dataset.sha256));
	const result = certify(parseCounts(bytes, claim.dimension), {
		method: claim.method,
		bases: claim.bases,
		fourier: claim.fourier,
		resamples,
		confidence: 0.99,
		seed,
		claim: claim.claimedSchmidtNumber,
		inputSha256: dataset.sha256
	});
	const id = newId();
	await database.models.Check.create({
		id,
		claimId,
		datasetId,
		createdBy: author.userId,
		status: 'done',
		progress: 1,
		resamples,
		confidence: 0.99,
		seed,
		result,
		startedAt: new Date(),
		finishedAt: new Date()
	});
	return { id, result };
}
