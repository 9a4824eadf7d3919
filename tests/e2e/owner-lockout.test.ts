/**
 * Nobody can lock the owner out (issue 16 part 3), against the built app behind a stated proxy
 * header (ADDRESS_HEADER=X-Forwarded-For, as README's abuse section asks behind a reverse proxy)
 * with the rate-limit table as shipped: 25 wrong passwords from 25 rotating client addresses
 * leave the owner signing in from their own address, while one address guessing is still paused.
 * Nothing waits for a time: the pauses are longer than the test. 429: RFC 6585 §4.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../src/lib/server/accounts/auth';
import { openDatabase } from '../../src/lib/server/db';
import { RATE_LIMITS } from '../../src/lib/server/core/rate-limits';
import { newId } from '../../src/lib/server/core/ids';
import { startApp, type AppServer } from './server';

let app: AppServer;
let dataDir: string;
const password = 'a long owner passphrase 16';
const email = 'tove.halvorsen@example.test';

beforeAll(async () => {
	dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-lockout-'));
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	await database.models.User.create({
		id: newId(),
		email,
		name: 'Tove Halvorsen',
		passwordHash: await hashPassword(password),
		accountRole: 'researcher',
		emailVerifiedAt: new Date()
	});
	await database.sequelize.close();
	// RANKSEAL_RATE_LIMITS empty: the table as shipped, not the roomy one page tests use.
	const env = {
		RANKSEAL_DATA_DIR: dataDir,
		RANKSEAL_RATE_LIMITS: '',
		ADDRESS_HEADER: 'X-Forwarded-For'
	};
	app = await startApp(env);
});

afterAll(async () => {
	await app?.stop();
	if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

const signIn = (guess: string, clientAddress: string) =>
	fetch(app.origin + '/login?/login', {
		method: 'POST',
		redirect: 'manual',
		headers: {
			origin: app.origin,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded',
			'x-forwarded-for': clientAddress
		},
		body: new URLSearchParams({ email, password: guess })
	});

describe('an attacker rotating client addresses', () => {
	it('cannot stop the owner signing in from their own address', async () => {
		const statuses = [];
		for (let i = 1; i <= 25; i++)
			statuses.push((await signIn(`guess ${i}`, `203.0.113.${i}`)).status);
		expect(statuses).toEqual(Array(25).fill(400));
		const owner = await signIn(password, '198.51.100.20');
		expect(owner.status).toBe(303);
		expect(owner.headers.get('set-cookie')).toMatch(/^rankseal_session=/);
	});

	it('is still paused when guessing from one address', async () => {
		const rule = RATE_LIMITS.signInAccountAddress;
		const statuses = [];
		for (let i = 0; i <= rule.free + 1; i++)
			statuses.push((await signIn(`again ${i}`, '192.0.2.66')).status);
		expect(statuses.slice(0, rule.free + 1)).toEqual(Array(rule.free + 1).fill(400));
		const paused = statuses.at(-1);
		expect(paused).toBe(429);
		// The owner's own address is untouched by that pause.
		expect((await signIn(password, '198.51.100.20')).status).toBe(303);
	});
});
