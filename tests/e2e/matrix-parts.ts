/**
 * The pieces the authorisation matrix's kits are built from (matrix-world.ts): people with a
 * session, memberships, finished checks, shares and API tokens, written straight into SQLite.
 */
import { readFileSync } from 'node:fs';
import { certify, parseCounts } from '../../src/lib/certify';
import type { UserActor } from '../../src/lib/server/core/actor';
import { hashPassword, sessionKey } from '../../src/lib/server/accounts/auth';
import type { Database } from '../../src/lib/server/db';
import type { GroupRole } from '../../src/lib/server/db/models/Membership';
import type { AccountRole } from '../../src/lib/server/db/models/User';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { newId, newSecret } from '../../src/lib/server/core/ids';

export const DAY = 86_400_000;
export const asUser = (userId: string, accountRole: AccountRole = 'researcher'): UserActor => ({
	kind: 'user',
	userId,
	accountRole,
	emailVerified: true
});

/** Everyone has this password, so that sign-in answers as it would for any real account. */
export const MATRIX_PASSWORD = 'matrix pass phrase 2026';
let passwordHash = '';

/** Hashes the shared password once, before any person is made. */
export async function preparePasswords(): Promise<void> {
	passwordHash ||= await hashPassword(MATRIX_PASSWORD);
}

export async function person(
	db: Database,
	tag: string,
	name: string,
	role: AccountRole = 'researcher'
) {
	const id = newId();
	const email = `${name}.${tag.toLowerCase()}@example.test`;
	const user = { id, email, name, passwordHash, accountRole: role };
	await db.models.User.create({ ...user, emailVerifiedAt: new Date() });
	const session = newId().replaceAll('-', '');
	await db.models.Session.create({
		id: sessionKey(session),
		userId: id,
		expiresAt: new Date(Date.now() + DAY)
	});
	return { id, email, session };
}

export async function member(db: Database, groupId: string, userId: string, role: GroupRole) {
	await db.models.Membership.create({ id: newId(), groupId, userId, role });
}

/** A done check holding the engine's own result, as the check runner stores it. */
export async function doneCheck(db: Database, claimId: string, datasetId: string, userId: string) {
	const claim = (await db.models.Claim.findByPk(claimId))!.get({ plain: true });
	const dataset = (await db.models.Dataset.findByPk(datasetId))!.get({ plain: true });
	const settings = { resamples: 200, confidence: 0.99, seed: 31 };
	const counts = parseCounts(readFileSync(datasetFilePath(dataset.sha256)), claim.dimension);
	const result = certify(counts, {
		...{ method: claim.method, bases: claim.bases, fourier: claim.fourier, ...settings },
		...{ claim: claim.claimedSchmidtNumber, inputSha256: dataset.sha256 }
	});
	const id = newId();
	const now = new Date();
	await db.models.Check.create({
		...{ id, claimId, datasetId, createdBy: userId, status: 'done', progress: 1 },
		...{ ...settings, result, startedAt: now, finishedAt: now }
	});
	return id;
}

export async function share(
	db: Database,
	claimId: string,
	sharedBy: string,
	editor: { email: string }
) {
	const { token, hash } = newSecret('shr_');
	const id = newId();
	const known = await db.models.User.findOne({ where: { email: editor.email } });
	await db.models.Share.create({
		...{ id, claimId, editorEmail: editor.email, editorId: (known?.get('id') as string) ?? null },
		...{ journal: 'J. Imag. Opt.', manuscript: 'JIO-1', tokenHash: hash, sharedBy }
	});
	return { id, token };
}

export const tokenOf = (url: string) => url.slice(url.lastIndexOf('/') + 1);

export async function apiToken(
	db: Database,
	userId: string,
	state: 'valid' | 'expired' | 'revoked'
) {
	const { token, hash } = newSecret('rks_');
	const id = newId();
	const expiresAt = new Date(Date.now() + (state === 'expired' ? -1000 : DAY));
	const revokedAt = state === 'revoked' ? new Date() : null;
	const row = { id, userId, name: `matrix ${state}`, prefix: token.slice(0, 12), tokenHash: hash };
	await db.models.ApiToken.create({ ...row, revokedAt, expiresAt });
	return { id, token };
}
