/**
 * Checks: runs of the engine on a claim's dataset with recorded settings. Starting one queues
 * it for the worker threads (checks/runner.ts); reading one shows its progress and result.
 */
import { col, type Transaction } from 'sequelize';
import { checkRequestSchemaFor, type CheckRequest } from '$lib/claims/schema';
import { DEFAULTS } from '$lib/certify';
import { accountIdOf, type Actor } from '../core/actor';
import { requireCheckCancel, requireClaim } from '../access/permissions';
import { checkBucket } from '../checks/queue';
import { hasCheckRunner, startCheckRunner } from '../checks/registry';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { ACTIVE_CHECK_STATUSES, type CheckAttributes } from '../db/models/Check';
import type { DatasetAttributes } from '../db/models/Dataset';
import { seedFor } from './analyses';
import { audit } from '../core/audit';
import { refuseOverCheckLimits } from './check-limits';
import { ConflictError, FieldError, NotFoundError } from '../core/errors';
import { newId } from '../core/ids';
import type { CheckView } from '$lib/views/checks';

export type { CheckView } from '$lib/views/checks';

export type { CheckRequest } from '$lib/claims/schema';

const isoOrNull = (value: Date | string | null | undefined) =>
	value ? new Date(value).toISOString() : null;

const view = (c: CheckAttributes, cancelledBy: string | null = null): CheckView => ({
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
	result: c.result,
	countsAdvice: c.countsAdvice ?? null,
	cancelledAt: isoOrNull(c.cancelledAt),
	cancelledBy,
	byReferee: !!c.reviewLinkId
});

/** The rows as views, with the name of whoever cancelled each (one query for all). */
async function views(database: Database, rows: CheckAttributes[]): Promise<CheckView[]> {
	const ids = [...new Set(rows.map((c) => c.cancelledBy).filter((id): id is string => !!id))];
	const users = ids.length ? await database.models.User.findAll({ where: { id: ids } }) : [];
	const names = new Map(users.map((u) => [u.get('id') as string, u.get('name') as string]));
	const by = (c: CheckAttributes) =>
		!c.cancelledAt
			? null
			: c.cancelledBy
				? (names.get(c.cancelledBy) ?? 'a removed account')
				: 'the referee';
	return rows.map((c) => view(c, by(c)));
}

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
	if (claim.method === 'fidelity-target' && !claim.target)
		throw new FieldError(
			'targetRun',
			'Upload the calibration run first (targetRun): λ is fitted on it and frozen before the first check.'
		);
	const options = checkRequestSchemaFor(claim).parse(request);
	const dataset = await chosenDataset(database, claimId, options.datasetId);
	const subtractAccidentals = options.subtractAccidentals ?? false;
	requireAccidentals(dataset, subtractAccidentals);
	const chosen = {
		resamples: options.resamples ?? DEFAULTS.resamples,
		confidence: options.confidence ?? DEFAULTS.confidence,
		subtractAccidentals
	};
	const settings = {
		...chosen,
		seed: await seedFor(database, claim, dataset, chosen, options.seed)
	};
	const reviewLinkId = actor.kind === 'referee' ? actor.linkId : null;
	const row = { id: newId(), claimId, datasetId: dataset.id, reviewLinkId, ...settings };
	await writeTransaction(database, (transaction) =>
		recordQueued(database, actor, claim.groupId, row, transaction)
	);
	(await startCheckRunner(database)).enqueue({
		id: row.id,
		bucket: checkBucket(claim.groupId, reviewLinkId)
	});
	return view((await database.models.Check.findByPk(row.id))!.get({ plain: true }));
}

/** The dataset asked for, or the claim's newest; NotFoundError / ConflictError when there is none. */
async function chosenDataset(
	database: Database,
	claimId: string,
	datasetId: string | undefined
): Promise<DatasetAttributes> {
	const { Dataset } = database.models;
	const dataset = datasetId
		? await Dataset.findOne({ where: { id: datasetId, claimId } })
		: await Dataset.findOne({
				where: { claimId },
				order: [
					['createdAt', 'DESC'],
					[col('rowid'), 'DESC']
				]
			});
	if (!dataset) {
		if (datasetId) throw new NotFoundError('No such dataset on this claim.');
		throw new ConflictError(
			'This claim has no counts file yet: upload one before running a check.'
		);
	}
	return dataset.get({ plain: true });
}

interface QueuedRow {
	id: string;
	claimId: string;
	datasetId: string;
	reviewLinkId: string | null;
	resamples: number;
	confidence: number;
	subtractAccidentals: boolean;
	seed: number;
}

/** The queued row and its audit event, within the check limits (in the caller's transaction). */
async function recordQueued(
	database: Database,
	actor: Actor,
	groupId: string,
	row: QueuedRow,
	transaction: Transaction
): Promise<void> {
	const userId = accountIdOf(actor);
	await refuseOverCheckLimits(database, actor, groupId, transaction);
	const { id, claimId, datasetId, reviewLinkId, ...settings } = row;
	await database.models.Check.create(
		{
			id,
			claimId,
			datasetId,
			createdBy: userId,
			reviewLinkId,
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
			groupId,
			action: 'check.queued',
			subjectType: 'check',
			subjectId: id,
			details: { datasetId, ...settings }
		},
		transaction
	);
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
	return (await views(database, [check]))[0];
}

/**
 * The authors' checks of the claim, newest first; referee re-runs are the referee's and stay on
 * the review page. NotFoundError when the claim is not visible.
 */
export async function listChecks(
	database: Database,
	actor: Actor,
	claimId: string
): Promise<CheckView[]> {
	await requireClaim(database, actor, claimId, 'read');
	const rows = await database.models.Check.findAll({
		where: { claimId, reviewLinkId: null },
		order: [
			['createdAt', 'DESC'],
			[col('rowid'), 'DESC']
		]
	});
	return views(
		database,
		rows.map((r) => r.get({ plain: true }))
	);
}

/** Whether the actor may cancel this check (the page shows the button only then). */
export async function mayCancelCheck(
	database: Database,
	actor: Actor,
	checkId: string
): Promise<boolean> {
	const check = (await database.models.Check.findByPk(checkId))?.get({ plain: true });
	if (!check) return false;
	return requireCheckCancel(database, actor, check).then(
		() => true,
		() => false
	);
}

/**
 * Cancels a queued or running check: the row becomes `cancelled` (who, when) first, then the
 * queue drops it or aborts its worker. ConflictError when it has already ended or was cancelled.
 */
export async function cancelCheck(
	database: Database,
	actor: Actor,
	checkId: string
): Promise<CheckView> {
	const { Check } = database.models;
	const row = await Check.findByPk(checkId);
	if (!row) throw new NotFoundError('No such check.');
	const check = row.get({ plain: true });
	const claim = await requireCheckCancel(database, actor, check).catch((problem) => {
		throw problem instanceof NotFoundError ? new NotFoundError('No such check.') : problem;
	});
	const cancelledBy = accountIdOf(actor);
	await writeTransaction(database, async (transaction) => {
		const now = new Date();
		const [changed] = await Check.update(
			{ status: 'cancelled', cancelledAt: now, cancelledBy, finishedAt: now },
			{ where: { id: checkId, status: ACTIVE_CHECK_STATUSES }, transaction }
		);
		if (!changed) {
			const status = (await Check.findByPk(checkId, { transaction }))!.get('status');
			throw new ConflictError(
				`This check is ${status} already; only a queued or running check can be cancelled.`
			);
		}
		const details = {
			was: check.status,
			reviewLinkId: actor.kind === 'referee' ? actor.linkId : undefined
		};
		const event = { actorId: cancelledBy, groupId: claim.groupId, action: 'check.cancelled' };
		await audit(
			database,
			{ ...event, subjectType: 'check', subjectId: checkId, details },
			transaction
		);
	});
	if (hasCheckRunner(database)) (await startCheckRunner(database)).cancel(checkId);
	return (await views(database, [(await Check.findByPk(checkId))!.get({ plain: true })]))[0];
}
