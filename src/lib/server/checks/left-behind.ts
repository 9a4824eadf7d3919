/**
 * The start-up sweep of checks: rows a previous process left queued or running. A check cut off
 * while running goes back to the queue (it restarts from replicate 0 with the same seed) until
 * it has been started MAX_CHECK_STARTS times; then it is failed with the reason, so that an
 * input that brings the server down every time cannot do so at every start.
 */
import type { Database } from '../db';
import { ACTIVE_CHECK_STATUSES, type CheckAttributes } from '../db/models/Check';
import { MAX_CHECK_STARTS } from './check-limits';
import { recordOutcome } from './outcome';
import { checkBucket, type QueuedCheck } from './queue';

/** The words a check failed by the sweep shows on its page and in the API. */
export const cutOffReason = (starts: number): string =>
	`Stopped: this check was cut off ${starts} times while running (the server or its worker ` +
	'stopped); it is not started again. Start a new check; if it happens again, tell the admin.';

/** Cut off while running as often as it may be: started that many times, never finished. */
const spent = (check: CheckAttributes): boolean =>
	check.status === 'running' && (check.attempts ?? 0) >= MAX_CHECK_STARTS;

/**
 * Fails the spent checks and marks the others queued again; returns those to queue, oldest
 * first. `held` names checks this process has in hand already (they are left alone).
 */
export async function sweepLeftChecks(
	database: Database,
	held: (checkId: string) => boolean
): Promise<QueuedCheck[]> {
	const { Check, Claim } = database.models;
	const rows = await Check.findAll({
		where: { status: ACTIVE_CHECK_STATUSES },
		order: [['createdAt', 'ASC']]
	});
	const checks = rows.map((r) => r.get({ plain: true })).filter((c) => !held(c.id));
	for (const check of checks.filter(spent)) {
		const failure = cutOffReason(check.attempts ?? 0);
		await recordOutcome(database, check, {
			startedAt: check.startedAt ?? new Date(),
			result: null,
			failure
		});
		console.error(`start-up sweep: check ${check.id} failed: cut off ${check.attempts} times`);
	}
	const again = checks.filter((c) => !spent(c));
	if (!again.length) return [];
	const where = { id: again.map((c) => c.id), status: ACTIVE_CHECK_STATUSES };
	await Check.update({ status: 'queued', progress: 0, startedAt: null }, { where });
	const claims = await Claim.findAll({
		where: { id: [...new Set(again.map((c) => c.claimId))] },
		attributes: ['id', 'groupId']
	});
	const groupOf = new Map(claims.map((c) => [c.get('id') as string, c.get('groupId') as string]));
	return again.map((c) => ({
		id: c.id,
		bucket: checkBucket(groupOf.get(c.claimId)!, c.reviewLinkId)
	}));
}
