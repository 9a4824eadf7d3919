/**
 * Checks: runs of the engine on a claim's dataset with recorded settings. Starting one queues
 * it for the worker threads (checks/runner.ts); reading one shows its progress and result.
 */
import { col } from 'sequelize';
import { checkRequestSchema, type CheckRequest } from '$lib/claims/schema';
import { DEFAULTS, InputError, type CertificationResult } from '$lib/certify';
import { hasCheckRunner, startCheckRunner } from '../checks/runner';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { CheckAttributes, CheckStatus } from '../db/models/Check';
import type { DatasetAttributes } from '../db/models/Dataset';
import { visibleClaim } from './access';
import { audit } from './audit';
import { requireVisibleClaim } from './claims';
import { NotFoundError } from './errors';
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

/** A background-subtracted check needs the file's own accidental estimates. */
function requireAccidentals(dataset: DatasetAttributes, subtract: boolean): void {
	if (subtract && !dataset.summary.hasAccidentals)
		throw new InputError(
			`Background subtraction needs an accidentals column, and ${dataset.originalName} has none.`
		);
}

/**
 * Queues a check of the claim on one of its datasets (default: the newest) and returns it
 * queued. NotFoundError for a claim or dataset out of sight; InputError for bad settings.
 */
export async function startCheck(
	database: Database,
	userId: string,
	claimId: string,
	request: CheckRequest = {}
): Promise<CheckView> {
	const claim = await requireVisibleClaim(database, userId, claimId);
	const parsed = checkRequestSchema.safeParse(request);
	if (!parsed.success) throw new InputError(parsed.error.issues.map((i) => i.message).join(' '));
	const options = parsed.data;
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
		throw new InputError('This claim has no counts file yet: upload one before running a check.');
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

/** The check, or null when it does not exist or its claim belongs to another group. */
export async function getCheck(
	database: Database,
	userId: string,
	checkId: string
): Promise<CheckView | null> {
	const row = await database.models.Check.findByPk(checkId);
	if (!row) return null;
	const check = row.get({ plain: true });
	if (!(await visibleClaim(database, userId, check.claimId))) return null;
	// A check left waiting by an earlier process resumes once someone looks at it.
	if ((check.status === 'queued' || check.status === 'running') && !hasCheckRunner(database)) {
		void startCheckRunner(database).catch((error) => console.error('check runner:', error));
	}
	return view(check);
}

/** The claim's checks, newest first; NotFoundError when the claim is not visible. */
export async function listChecks(
	database: Database,
	userId: string,
	claimId: string
): Promise<CheckView[]> {
	await requireVisibleClaim(database, userId, claimId);
	const rows = await database.models.Check.findAll({
		where: { claimId },
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		]
	});
	return rows.map((r) => view(r.get({ plain: true })));
}
