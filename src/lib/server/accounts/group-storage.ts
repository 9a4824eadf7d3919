/**
 * Storage quotas per group: the counts files of a group's claims, each distinct file once (they
 * are stored by SHA-256), against config().groupQuotaBytes. Uploads over it are refused.
 */
import type { Transaction } from 'sequelize';
import type { Actor } from '../core/actor';
import { requireGroup } from '../access/permissions';
import { config } from '../core/config';
import type { Database } from '../db';
import { ConflictError } from '../core/errors';

export interface GroupStorage {
	usedBytes: number;
	quotaBytes: number;
}

/** "1.5 MiB": binary units, as the limits are set. */
export function byteWords(bytes: number): string {
	const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
	let value = bytes;
	let unit = 0;
	while (value >= 1024 && unit < units.length - 1) {
		value /= 1024;
		unit++;
	}
	return unit === 0
		? `${bytes} bytes`
		: `${Number(value.toFixed(value < 10 ? 2 : 1))} ${units[unit]}`;
}

/** Distinct counts files of the group's claims: SHA-256 → size. */
async function groupFiles(
	database: Database,
	groupId: string,
	transaction?: Transaction
): Promise<Map<string, number>> {
	const claims = await database.models.Claim.findAll({
		where: { groupId },
		attributes: ['id'],
		transaction
	});
	const rows = await database.models.Dataset.findAll({
		where: { claimId: claims.map((c) => c.get('id') as string) },
		attributes: ['sha256', 'byteSize'],
		transaction
	});
	return new Map(rows.map((r) => [r.get('sha256') as string, Number(r.get('byteSize'))]));
}

const total = (files: Map<string, number>) => [...files.values()].reduce((s, n) => s + n, 0);

/** Refuses an upload that would take the group over its quota; run in the storing transaction. */
export async function refuseOverQuota(
	database: Database,
	groupId: string,
	upload: { sha256: string; byteSize: number },
	transaction: Transaction
): Promise<void> {
	const files = await groupFiles(database, groupId, transaction);
	if (files.has(upload.sha256)) return;
	const used = total(files);
	const quota = config().groupQuotaBytes;
	if (used + upload.byteSize <= quota) return;
	throw new ConflictError(
		`This file (${byteWords(upload.byteSize)}) would take the group’s counts files to ${byteWords(used + upload.byteSize)}, over its storage quota of ${byteWords(quota)} (${byteWords(used)} used). Take back counts files no check has used, or ask an admin for a larger quota.`
	);
}

/** What the group's counts files take and may take; for its leads only. */
export async function groupStorage(
	database: Database,
	actor: Actor,
	groupId: string
): Promise<GroupStorage> {
	await requireGroup(database, actor, groupId, 'manage');
	return {
		usedBytes: total(await groupFiles(database, groupId)),
		quotaBytes: config().groupQuotaBytes
	};
}
