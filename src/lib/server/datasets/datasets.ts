/**
 * Datasets: uploaded counts files, parsed before anything is stored, their bytes placed in the
 * counts store (storage/counts-store.ts) with their row and audit event in one transaction.
 */
import { tidyFileName } from '$lib/text-rules';
import { readFile } from 'node:fs/promises';
import { col, type Transaction } from 'sequelize';
import { InputError } from '$lib/certify';
import { dateTimeInWords } from '$lib/dates';
import { sha256Hex } from '$lib/evidence/hash';
import { countsFormatOf } from '$lib/evidence/layout';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import { engineTasks } from '../checks/registry';
import type { EngineTasks } from '../checks/engine-tasks';
import { trialsPart } from '../checks/trials-task';
import { targetPart } from '../checks/target-task';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { DatasetAttributes } from '../db/models/Dataset';
import type { DatasetTables, DatasetView } from '$lib/views/datasets';
import { audit } from '../core/audit';
import { checkCalibrationUpload } from './dataset-calibration';
import { ConflictError, NotFoundError } from '../core/errors';
import { refuseOverQuota } from '../accounts/group-storage';
import { newId } from '../core/ids';
import { datasetFilePath, removeCounts, storeCounts } from '../storage/counts-store';

export type { DatasetSummary, DatasetTables, DatasetView, PreviewTable } from '$lib/views/datasets';

const view = (row: DatasetAttributes): DatasetView => ({
	id: row.id,
	claimId: row.claimId,
	sha256: row.sha256,
	byteSize: row.byteSize,
	format: row.format,
	originalName: row.originalName,
	createdAt: new Date(row.createdAt ?? 0).toISOString(),
	summary: row.summary,
	calibrationSha256: row.calibrationSha256 ?? null
});

/** The same bytes twice on one claim would be two rows that say one thing: refuse, naming the first. */
async function refuseRepeatedUpload(
	database: Database,
	claimId: string,
	sha256: string,
	transaction: Transaction
): Promise<void> {
	const earlier = await database.models.Dataset.findOne({
		where: { claimId, sha256 },
		transaction
	});
	if (!earlier) return;
	const { originalName, createdAt } = earlier.get({ plain: true });
	const when = dateTimeInWords(createdAt ?? 0);
	throw new ConflictError(
		`These exact bytes (SHA-256 ${sha256.slice(0, 12)}…) were uploaded to this claim already, as ${originalName} on ${when}.`
	);
}

type Claim = Awaited<ReturnType<typeof requireClaim>>;
type Summarised = Extract<Awaited<ReturnType<EngineTasks['summarise']>>, { ok: true }>;

/** The file read by the engine against the claim, or InputError naming its line. */
async function summariseUpload(
	database: Database,
	claim: Claim,
	bytes: Uint8Array,
	userId: string
): Promise<Summarised> {
	const runner = await engineTasks(database);
	const read = await runner.summarise(
		{ bytes, ...claim, trials: trialsPart(claim), separateFrom: targetPart(claim)?.run ?? null },
		`upload:${userId}`
	);
	if (!read.ok)
		throw new InputError(read.message, read.line ?? undefined, read.column ?? undefined);
	return read;
}

interface NewDataset {
	id: string;
	claim: Claim;
	userId: string;
	bytes: Uint8Array;
	sha256: string;
	originalName: string;
	read: Summarised;
	calibrated: ReturnType<typeof checkCalibrationUpload>;
}

/** The row and its audit event, inside the upload's transaction. */
async function recordDataset(
	database: Database,
	d: NewDataset,
	transaction: Transaction
): Promise<void> {
	const { id, claim, userId, bytes, sha256, originalName, read, calibrated } = d;
	await refuseRepeatedUpload(database, claim.id, sha256, transaction);
	await refuseOverQuota(
		database,
		claim.groupId,
		{ sha256, byteSize: bytes.byteLength },
		transaction
	);
	await database.models.Dataset.create(
		{
			id,
			claimId: claim.id,
			createdBy: userId,
			sha256,
			byteSize: bytes.byteLength,
			format: countsFormatOf(bytes),
			originalName,
			summary: read.summary,
			preview: read.preview,
			countsSha256: read.countsSha256,
			...calibrated
		},
		{ transaction }
	);
	const details = {
		sha256,
		byteSize: bytes.byteLength,
		originalName,
		...(calibrated ? { calibrationSha256: calibrated.calibrationSha256 } : {})
	};
	const event = { actorId: userId, groupId: claim.groupId, action: 'dataset.added' } as const;
	await audit(database, { ...event, subjectType: 'dataset', subjectId: id, details }, transaction);
}

/**
 * Validates a counts file against the claim (dimension, and the tables its method and bases
 * need), then stores it. Throws InputError naming the line for a bad file and NotFoundError
 * when the claim is not visible; on any failure no row and no new file remain.
 */
export async function addDataset(
	database: Database,
	actor: Actor,
	claimId: string,
	upload: { bytes: Uint8Array; originalName: string; calibration?: Uint8Array | null }
): Promise<DatasetView> {
	const claim = await requireClaim(database, actor, claimId, 'add-dataset');
	const calibrated = checkCalibrationUpload(upload.calibration, claim);
	const userId = accountIdOf(actor)!;
	const { bytes } = upload;
	const read = await summariseUpload(database, claim, bytes, userId);
	const sha256 = sha256Hex(bytes);
	const originalName = tidyFileName(upload.originalName, 'counts');
	const id = newId();
	const dataset = { id, claim, userId, bytes, sha256, originalName, read, calibrated };
	let wrote = false;
	try {
		await writeTransaction(database, async (transaction) => {
			await recordDataset(database, dataset, transaction);
			wrote = (await storeCounts(sha256, bytes)) || wrote;
		});
	} catch (error) {
		// Another upload may have stored the same bytes meanwhile; remove them only when unused.
		if (wrote && (await database.models.Dataset.count({ where: { sha256 } })) === 0) {
			await removeCounts(sha256);
		}
		throw error;
	}
	return view((await database.models.Dataset.findByPk(id))!.get({ plain: true }));
}

/** The claim's datasets, newest first; NotFoundError when the claim is not visible. */
export async function listDatasets(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<DatasetView[]> {
	await requireClaim(database, actor, claimId, 'read-datasets');
	const rows = await database.models.Dataset.findAll({
		where: { claimId },
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		]
	});
	return rows.map((r) => view(r.get({ plain: true })));
}

/** The dataset's row when the actor may read its claim's counts; NotFoundError otherwise. */
async function readableDataset(
	database: Database,
	actor: Actor,
	datasetId: string
): Promise<DatasetAttributes> {
	const row = await database.models.Dataset.findByPk(datasetId);
	if (!row) throw new NotFoundError('No such dataset.');
	const dataset = row.get({ plain: true });
	await requireClaim(database, actor, dataset.claimId, 'read-datasets').catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such dataset.') : problem;
	});
	return dataset;
}

/** The dataset; NotFoundError when it does not exist or its claim is out of the actor's sight. */
export async function getDataset(
	database: Database,
	actor: Actor,
	datasetId: string
): Promise<DatasetView> {
	return view(await readableDataset(database, actor, datasetId));
}

/**
 * Per-basis d×d count tables of a stored dataset (for heat maps); NotFoundError when not visible.
 * Rows from before migration 0004 have none stored: they are read once, on a worker, and kept.
 */
export async function datasetTables(
	database: Database,
	actor: Actor,
	datasetId: string
): Promise<DatasetTables> {
	const dataset = await readableDataset(database, actor, datasetId);
	const dimension = dataset.summary.dimension;
	if (dataset.preview) return { dimension, tables: dataset.preview };
	const runner = await engineTasks(database);
	const bases = dataset.summary.bases;
	const bytes = await readFile(datasetFilePath(dataset.sha256));
	const claim = (await database.models.Claim.findByPk(dataset.claimId))!.get({ plain: true });
	const trials = trialsPart(claim);
	const task = { bytes, ...claim, bases: trials ? claim.bases : [], trials };
	const read = await runner.summarise(task, `upload:${accountIdOf(actor) ?? 'reader'}`);
	if (!read.ok) throw new InputError(read.message, read.line ?? undefined);
	const preview = read.preview.filter((t) => bases.includes(t.basis));
	await database.models.Dataset.update({ preview }, { where: { id: datasetId } });
	return { dimension, tables: preview };
}
