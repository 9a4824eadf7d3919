import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import {
	authenticate,
	createToken,
	listTokens,
	revokeToken,
	TOKEN_DEFAULT_DAYS
} from '../../src/lib/server/accounts/tokens';
import { asUser } from './actors';
import { addGroup, addUser } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let lead: string, author: string;
const DAY_MS = 24 * 60 * 60 * 1000;

beforeAll(async () => {
	ctx = await temporaryDatabase();
	const lake = await addGroup(ctx.database, 'Lake optics');
	lead = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	author = await addUser(ctx.database, 'Ben Osei', [[lake, 'author']]);
});
afterAll(async () => ctx.close());

describe('API tokens', () => {
	it('shows the token once and stores only its SHA-256', async () => {
		const created = await createToken(ctx.database, asUser(lead), { name: '  nightly upload ' });
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
		expect(JSON.stringify(await listTokens(ctx.database, asUser(lead)))).not.toContain(
			created.token
		);
	});

	it('authenticates as a token caller acting for its owner, and records the use', async () => {
		const { token, id } = await createToken(ctx.database, asUser(lead), { name: 'lab PC' });
		expect(await authenticate(ctx.database, token)).toEqual({
			kind: 'token',
			userId: lead,
			accountRole: 'researcher',
			emailVerified: true,
			tokenId: id,
			scope: 'claims'
		});
		const used = (await listTokens(ctx.database, asUser(lead))).find((t) => t.id === id);
		expect(used?.lastUsedAt).not.toBeNull();
		expect(await authenticate(ctx.database, token + 'x')).toBeNull();
		expect(await authenticate(ctx.database, 'not-a-token')).toBeNull();
	});

	it('rejects a revoked token; only its owner may revoke it', async () => {
		const { token, id } = await createToken(ctx.database, asUser(lead), { name: 'old laptop' });
		await expect(revokeToken(ctx.database, asUser(author), id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await revokeToken(ctx.database, asUser(lead), id);
		await revokeToken(ctx.database, asUser(lead), id);
		expect(await authenticate(ctx.database, token)).toBeNull();
		expect(
			(await listTokens(ctx.database, asUser(lead))).find((t) => t.id === id)?.revokedAt
		).not.toBeNull();
	});

	it('lets group leads, authors and editors issue tokens, nobody else, and wants a name', async () => {
		expect((await createToken(ctx.database, asUser(author), { name: 'mine' })).token).toMatch(
			/^rks_/
		);
		const outsider = await addUser(ctx.database, 'Nobody', []);
		await expect(
			createToken(ctx.database, asUser(outsider), { name: 'mine' })
		).rejects.toBeInstanceOf(ForbiddenError);
		const editor = await addUser(ctx.database, 'Eda Editor', []);
		const forEditor = await createToken(ctx.database, asUser(editor, 'editor'), { name: 'desk' });
		expect(forEditor.token).toMatch(/^rks_/);
		await expect(createToken(ctx.database, asUser(lead), { name: '   ' })).rejects.toThrow(
			/Name the token/
		);
	});

	it('expires after 90 days unless told otherwise; "never" and a chosen number of days', async () => {
		const before = Date.now();
		const plain = await createToken(ctx.database, asUser(lead), { name: 'default' });
		const expires = new Date(plain.expiresAt!).getTime();
		// Bounds taken around the call, so the check holds however long the call takes.
		expect(expires).toBeGreaterThanOrEqual(before + TOKEN_DEFAULT_DAYS * DAY_MS);
		expect(expires).toBeLessThanOrEqual(Date.now() + TOKEN_DEFAULT_DAYS * DAY_MS);
		expect(TOKEN_DEFAULT_DAYS).toBe(90);
		const week = await createToken(ctx.database, asUser(lead), { name: 'w', expiresInDays: '7' });
		expect(new Date(week.expiresAt!).getTime()).toBeLessThanOrEqual(Date.now() + 7 * DAY_MS);
		const never = await createToken(ctx.database, asUser(lead), {
			name: 'n',
			expiresInDays: 'never'
		});
		expect(never.expiresAt).toBeNull();
		for (const bad of ['0', '-3', '1.5', '366', 'soon'])
			await expect(
				createToken(ctx.database, asUser(lead), { name: 'x', expiresInDays: bad })
			).rejects.toThrow(/day|never/i);
	});

	it('refuses an expired token', async () => {
		const { token, id } = await createToken(ctx.database, asUser(lead), { name: 'short' });
		expect(await authenticate(ctx.database, token)).not.toBeNull();
		// Move the expiry into the past rather than wait for it.
		await ctx.database.models.ApiToken.update(
			{ expiresAt: new Date(Date.now() - 1000) },
			{ where: { id } }
		);
		expect(await authenticate(ctx.database, token)).toBeNull();
	});

	it('is managed by a person signed in, never by a token itself', async () => {
		const { token } = await createToken(ctx.database, asUser(lead), { name: 'robot' });
		const robot = (await authenticate(ctx.database, token))!;
		await expect(createToken(ctx.database, robot, { name: 'child' })).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await expect(listTokens(ctx.database, robot)).rejects.toBeInstanceOf(ForbiddenError);
	});
});
