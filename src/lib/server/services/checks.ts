/**
 * Checks: runs of the engine on a claim's dataset with recorded settings. Starting one queues
 * it for the worker threads (checks/runner.ts); reading one shows its progress and result.
 */
import { col } from 'sequelize';
import { checkRequestSchema, type CheckRequest } from '$lib/claims/schema';
import { DEFAULTS, type CertificationResult } from '$lib/certify';
import { accountIdOf, type Actor } from '../access/actor';
import { requireClaim } from '../access/permissions';
import { hasCheckRunner, startCheckRunner } from '../checks/runner';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { CheckAttributes, CheckStatus } from '../db/models/Check';
import type { DatasetAttributes } from '../db/models/Dataset';
import { audit } from './audit';
import { ConflictError, FieldError, NotFoundError } from './errors';
import { newId } from './ids';

export type { CheckRequest } from '$lib/claims/schema';

export interface CheckView {
	id: string;
	claimId: string;
	datasetId: string;
	status: CheckStatus;
	/** 0..1 */
	progress: number;
	resamples: number;
	confidence: number;
	seed: number;
	/** Accidentals subtracted before normalising: the result is labelled background-subtracted. */
	subtractAccidentals: boolean;
	createdAt: string;
	startedAt: string | null;
	finishedAt: string | null;
	error: string | null;
	result: CertificationResult | null;
}

const isoOrNull = (value: Date | string | null | undefined) =>
	value ? new Date(value).toISOString() : null;

const view = (c: CheckAttributes): CheckView => ({
	id: c.id,
	claimId: c.claimId,
	datasetId: c.datasetId,
	status: c.status,
	progress: c.progress,
	resamples: c.resamples,
	confidence: c.confidence,
	seed: Number(c.seed),
	subtractAccidentals: !!c.subtractAccidentals,
	createdAt: new Date(c.createdAt ?? 0).toISOString(),
	startedAt: isoOrNull(c.startedAt),
	finishedAt: isoOrNull(c.finishedAt),
	error: c.error,
	result: c.result
});

/** Subtraction needs the file's own accidental estimates; the setting is at fault, not the file. */
function requireAccidentals(dataset: DatasetAttributes, subtract: boolean): void {
	if (subtract && !dataset.summary.hasAccidentals)
		throw new FieldError(
			'subtractAccidentals',
			`Background subtraction needs an accidentals column, and ${dataset.originalName} has none.`
		);
}

/**
 * Queues a check of the claim on one of its datasets (default: the newest) and returns it
 * queued. NotFoundError for a claim or dataset out of sight; a ZodError for bad settings;
 * ConflictError while the claim has no counts file.
 */
export async function startCheck(
	database: Database,
	actor: Actor,
	claimId: string,
	request: CheckRequest = {}
): Promise<CheckView> {
	const claim = await requireClaim(database, actor, claimId, 'start-check');
	const options = checkRequestSchema.parse(request);
	const userId = accountIdOf(actor);
	const { Check, Dataset } = database.models;
	const dataset = options.datasetId
		? await Dataset.findOne({ where: { id: options.datasetId, claimId } })
		: await Dataset.findOne({
				where: { claimId },
				order: [
					['createdAt', 'DESC'],
					[col('rowid'), 'DESC']
				]
			});
	if (!dataset) {
		if (options.datasetId) throw new NotFoundError('No such dataset on this claim.');
		throw new ConflictError(
			'This claim has no counts file yet: upload one before running a check.'
		);
	}
	const subtractAccidentals = options.subtractAccidentals ?? false;
	requireAccidentals(dataset.get({ plain: true }), subtractAccidentals);
	const id = newId();
	const settings = {
		resamples: options.resamples ?? DEFAULTS.resamples,
		confidence: options.confidence ?? DEFAULTS.confidence,
		seed: options.seed ?? DEFAULTS.seed,
		subtractAccidentals
	};
	await writeTransaction(database, async (transaction) => {
		await Check.create(
			{
				id,
				claimId,
				datasetId: dataset.get('id') as string,
				createdBy: userId,
				status: 'queued',
				progress: 0,
				...settings
			},
			{ transaction }
		);
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.groupId,
				action: 'check.queued',
				subjectType: 'check',
				subjectId: id,
				details: { datasetId: dataset.get('id'), ...settings }
			},
			transaction
		);
	});
	(await startCheckRunner(database)).enqueue(id);
	return view((await Check.findByPk(id))!.get({ plain: true }));
}

/** The check; NotFoundError when it does not exist or the actor may not see its claim. */
export async function getCheck(
	database: Database,
	actor: Actor,
	checkId: string
): Promise<CheckView> {
	const row = await database.models.Check.findByPk(checkId);
	if (!row) throw new NotFoundError('No such check.');
	const check = row.get({ plain: true });
	await requireClaim(database, actor, check.claimId, 'read').catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such check.') : problem;
	});
	// A check left waiting by an earlier process resumes once someone looks at it.
	if ((check.status === 'queued' || check.status === 'running') && !hasCheckRunner(database)) {
		void startCheckRunner(database).catch((error) => console.error('check runner:', error));
	}
	return view(check);
}

/** The claim's checks, newest first; NotFoundError when the claim is not visible. */
export async function listChecks(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<CheckView[]> {
	await requireClaim(database, actor, claimId, 'read');
	const rows = await database.models.Check.findAll({
		where: { claimId },
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		]
	});
	return rows.map((r) => view(r.get({ plain: true })));
}
