/**
 * The demo scenario, seeded into a fresh data folder before the built app starts, with every
 * demo check finished (the runner is awaited, not polled), plus browser sessions for each role
 * and for a researcher who is in no group.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import { openDatabase } from '../../src/lib/server/db';
import { DEMO_PEOPLE } from '../../src/lib/server/demo/scenario';
import { seedDemo } from '../../src/lib/server/demo/seed';
import { newId } from '../../src/lib/server/core/ids';
import { catcherTransport, createMailer } from '../../src/lib/server/mail/mail';
import { startMailCatcher } from '../../src/lib/server/mail/mail-catcher';

export interface PagesWorld {
	dataDir: string;
	/** Session cookie values by demo key (lead, author1, editor, admin), and `loner` (no group). */
	sessions: Record<string, string>;
}

export async function seedPagesWorld(): Promise<PagesWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-pages-'));
	const workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-pages-worker-'));
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(workerFolder, 'w.mjs'));
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		// The demo's notices go to a real catcher on a free port, stored in this data folder.
		const catcher = await startMailCatcher(database, 0);
		const from = 'Rankseal <no-reply@rankseal.invalid>';
		const mailer = createMailer({
			transport: catcherTransport(catcher.port),
			from,
			origin: 'http://127.0.0.1'
		});
		await seedDemo(database).finally(async () => {
			mailer.close();
			await catcher.close();
		});
		await (await startCheckRunner(database)).idle();
		await stopCheckRunner(database);
		const { User, Session } = database.models;
		const sessions: Record<string, string> = {};
		const open = async (key: string, userId: string) => {
			sessions[key] = newId().replaceAll('-', '');
			const expiresAt = new Date(Date.now() + 86_400_000);
			await Session.create({ id: sessionKey(sessions[key]), userId, expiresAt });
		};
		for (const person of DEMO_PEOPLE) {
			const user = await User.findOne({ where: { email: person.email } });
			await open(person.key, user!.get('id') as string);
			await open(`${person.key}-2`, user!.get('id') as string);
		}
		const loner = newId();
		await User.create({
			id: loner,
			email: 'ines.vale@example.test',
			name: 'Ines Vale',
			passwordHash: 'unused',
			accountRole: 'researcher',
			emailVerifiedAt: new Date()
		});
		await open('loner', loner);
		return { dataDir, sessions };
	} finally {
		await database.sequelize.close();
		rmSync(workerFolder, { recursive: true, force: true });
		process.env = saved;
	}
}
