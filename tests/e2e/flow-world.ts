/**
 * People for the browser flow, written into a fresh data folder before the built app starts:
 * an admin (to read the mail outbox) and a member of another group with a claim of its own.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { openDatabase } from '../../src/lib/server/db';
import { newId } from '../../src/lib/server/core/ids';

export interface FlowWorld {
	dataDir: string;
	adminSession: string;
	outsiderSession: string;
}

export async function seedFlowWorld(): Promise<FlowWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-flow-'));
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const { User, Group, Membership, Session } = database.models;
	const person = async (name: string, accountRole: 'admin' | 'researcher') => {
		const id = newId();
		const email = `${name.split(' ')[0].toLowerCase()}@example.test`;
		await User.create({
			id,
			email,
			name,
			passwordHash: 'unused',
			accountRole,
			emailVerifiedAt: new Date()
		});
		const session = newId().replaceAll('-', '');
		await Session.create({
			id: sessionKey(session),
			userId: id,
			expiresAt: new Date(Date.now() + 86_400_000)
		});
		return { id, session };
	};
	const admin = await person('Ava Admin', 'admin');
	const outsider = await person('Otto Fenwick', 'researcher');
	const groupId = newId();
	await Group.create({ id: groupId, name: 'Fenwick Ridge Qudits (fictional)' });
	await Membership.create({ id: newId(), groupId, userId: outsider.id, role: 'lead' });
	await database.sequelize.close();
	return { dataDir, adminSession: admin.session, outsiderSession: outsider.session };
}
