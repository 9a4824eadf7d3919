/**
 * People for the API test, written straight into a fresh data folder's SQLite file before the
 * built app starts on it: two groups with one lead each, their API tokens, a revoked token
 * and a browser session. Also the list of endpoints the source serves, for the OpenAPI test.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { openDatabase } from '../../src/lib/server/db';
import { newId, newSecret } from '../../src/lib/server/core/ids';

export interface ApiWorld {
	dataDir: string;
	/** Bearer tokens of the two leads; `revoked` and `expired` belong to the first and no longer work. */
	tokens: { lake: string; ridge: string; revoked: string; expired: string };
	/** A session cookie value of the first lead. */
	session: string;
}

export async function seedApiWorld(): Promise<ApiWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-api-'));
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const { User, Group, Membership, ApiToken, Session } = database.models;
	const lead = async (name: string, groupName: string) => {
		const userId = newId();
		const groupId = newId();
		const email = `${name.split(' ')[0].toLowerCase()}@example.test`;
		await User.create({
			id: userId,
			email,
			name,
			passwordHash: 'unused',
			accountRole: 'researcher',
			emailVerifiedAt: new Date()
		});
		await Group.create({ id: groupId, name: groupName });
		await Membership.create({ id: newId(), groupId, userId, role: 'lead' });
		return userId;
	};
	const token = async (userId: string, revoked = false, expiresAt: Date | null = null) => {
		const { token, hash } = newSecret('rks_');
		await ApiToken.create({
			id: newId(),
			userId,
			name: 'api test',
			prefix: token.slice(0, 12),
			tokenHash: hash,
			revokedAt: revoked ? new Date() : null,
			expiresAt
		});
		return token;
	};
	const ada = await lead('Ada Lind', 'Lake optics');
	const cyd = await lead('Cyd Marsh', 'Ridge qudits');
	const session = newId().replaceAll('-', '');
	await Session.create({
		id: sessionKey(session),
		userId: ada,
		expiresAt: new Date(Date.now() + 86_400_000)
	});
	const tokens = {
		lake: await token(ada),
		ridge: await token(cyd),
		revoked: await token(ada, true),
		expired: await token(ada, false, new Date(Date.now() - 1000))
	};
	await database.sequelize.close();
	return { dataDir, tokens, session };
}

/** "METHOD /path/{id}" for every handler exported by a +server.ts under src/routes/api/v1. */
export function servedEndpoints(): string[] {
	const root = path.resolve('src/routes/api/v1');
	const files = readdirSync(root, { recursive: true, encoding: 'utf8' });
	return files
		.filter((file) => path.basename(file) === '+server.ts')
		.flatMap((file) => {
			const folder = path.dirname(file).split(path.sep).join('/');
			const route = ('/api/v1/' + folder).replace(/\/\.$/, '').replace(/\[(\w+)\]/g, '{$1}');
			const source = readFileSync(path.join(root, file), 'utf8');
			const exported =
				/export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g;
			return [...source.matchAll(exported)].map((m) => `${m[1]} ${route}`);
		});
}
