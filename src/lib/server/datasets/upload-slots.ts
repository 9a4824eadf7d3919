/**
 * Counts uploads in progress at once: each holds its file (up to 20 MiB) and the tables read from
 * it, so a person may have RANKSEAL_UPLOADS_PER_USER (2) and a group's members
 * RANKSEAL_UPLOADS_PER_GROUP (4) at once; one more answers 429 with Retry-After. A slot is taken
 * before the body is read and given back when the upload is stored or refused. Counted in this
 * process: an upload lives within one request.
 */
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import { config } from '../core/config';
import type { Database } from '../db';
import { RateLimitedError } from '../core/errors';

const byUser = new Map<string, number>();
const byGroup = new Map<string, number>();

const bump = (counts: Map<string, number>, key: string, by: number) => {
	const next = (counts.get(key) ?? 0) + by;
	if (next > 0) counts.set(key, next);
	else counts.delete(key);
};

function refuseOverUploadLimits(userId: string, groupId: string): void {
	const { uploadsPerUser, uploadsPerGroup, uploadRetryAfterSeconds: wait } = config();
	const own = byUser.get(userId) ?? 0;
	if (own >= uploadsPerUser)
		throw new RateLimitedError(
			`You have ${own} uploads in progress; the limit is ${uploadsPerUser} at once per person. Wait for one to finish.`,
			wait
		);
	const group = byGroup.get(groupId) ?? 0;
	if (group >= uploadsPerGroup)
		throw new RateLimitedError(
			`This group has ${group} uploads in progress; the limit is ${uploadsPerGroup} at once per group. Wait for one to finish.`,
			wait
		);
}

/**
 * Runs `upload` (reading the body and storing the dataset) in one of the caller's slots. The
 * claim is checked first, so that a hidden claim is a 404 before anything is read.
 */
export async function withUploadSlot<T>(
	database: Database,
	actor: Actor,
	claimId: string,
	upload: () => Promise<T>
): Promise<T> {
	const claim = await requireClaim(database, actor, claimId, 'add-dataset');
	const userId = accountIdOf(actor) ?? actor.kind;
	refuseOverUploadLimits(userId, claim.groupId);
	bump(byUser, userId, 1);
	bump(byGroup, claim.groupId, 1);
	try {
		return await upload();
	} finally {
		bump(byUser, userId, -1);
		bump(byGroup, claim.groupId, -1);
	}
}
