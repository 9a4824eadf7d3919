import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/services/errors';
import {
	authenticate,
	createToken,
	listTokens,
	revokeToken
} from '../../src/lib/server/services/tokens';
import { addGroup, addUser } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let lead: string, author: string;

beforeAll(async () => {
	ctx = await temporaryDatabase();
	const lake = await addGroup(ctx.database, 'Lake optics');
	lead = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	author = await addUser(ctx.database, 'Ben Osei', [[lake, 'author']]);
});
afterAll(async () => ctx.close());

describe('API tokens', () => {
	it('shows the token once and stores only its SHA-256', async () => {
		const created = await createToken(ctx.database, lead, '  nightly upload ');
		expect(created.token).toMatch(/^rks_[A-Za-z0-9_-]{43}$/);
		expect(created).toMatchObject({
			name: 'nightly upload',
			prefix: created.token.slice(0, 12),
			revokedAt: null,
			lastUsedAt: null
		});
		const row = (await ctx.database.models.ApiToken.findByPk(created.id))!.get({ plain: true });
		expect(row.tokenHash).toBe(sha256Hex(created.token));
		expect(JSON.stringify(row)).not.toContain(created.token);
		expect(JSON.stringify(await listTokens(ctx.database, lead))).not.toContain(created.token);
	});

	it('authenticates as the user and records the use', async () => {
		const { token, id } = await createToken(ctx.database, lead, 'lab PC');
		expect(await authenticate(ctx.database, token)).toMatchObject({
			id: lead,
			name: 'Ada Lind',
			accountRole: 'researcher',
			emailVerified: true
		});
		const used = (await listTokens(ctx.database, lead)).find((t) => t.id === id);
		expect(used?.lastUsedAt).not.toBeNull();
		expect(await authenticate(ctx.database, token + 'x')).toBeNull();
		expect(await authenticate(ctx.database, 'not-a-token')).toBeNull();
	});

	it('rejects a revoked token; only its owner may revoke it', async () => {
		const { token, id } = await createToken(ctx.database, lead, 'old laptop');
		await expect(revokeToken(ctx.database, author, id)).rejects.toBeInstanceOf(NotFoundError);
		await revokeToken(ctx.database, lead, id);
		await revokeToken(ctx.database, lead, id);
		expect(await authenticate(ctx.database, token)).toBeNull();
		expect(
			(await listTokens(ctx.database, lead)).find((t) => t.id === id)?.revokedAt
		).not.toBeNull();
	});

	it('lets group leads and authors issue tokens, nobody outside a group, and wants a name', async () => {
		expect((await createToken(ctx.database, author, 'mine')).token).toMatch(/^rks_/);
		const outsider = await addUser(ctx.database, 'Nobody', []);
		await expect(createToken(ctx.database, outsider, 'mine')).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await expect(createToken(ctx.database, lead, '   ')).rejects.toThrow(/Name the token/);
	});
});
