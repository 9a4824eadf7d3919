/**
 * Sign-in sessions through lucia 3 with a Sequelize adapter, and Argon2id password hashes
 * (@node-rs/argon2's default algorithm).
 */
import { hash, verify } from '@node-rs/argon2';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { Op } from 'sequelize';
import type { Database } from './db';
import type { AccountRole } from './db/models/User';

export interface SessionUser {
	id: string;
	email: string;
	name: string;
	accountRole: AccountRole;
	emailVerified: boolean;
}

function sequelizeAdapter(database: Database): Adapter {
	const { Session, User } = database.models;
	const toSession = (row: { id: string; userId: string; expiresAt: Date }): DatabaseSession => ({
		id: row.id,
		userId: row.userId,
		expiresAt: new Date(row.expiresAt),
		attributes: {}
	});
	return {
		async getSessionAndUser(sessionId) {
			const session = await Session.findByPk(sessionId);
			if (!session) return [null, null];
			const user = await User.findByPk(session.get('userId') as string);
			if (!user) return [null, null];
			const u = user.get({ plain: true });
			const databaseUser: DatabaseUser = {
				id: u.id,
				attributes: {
					email: u.email,
					name: u.name,
					accountRole: u.accountRole,
					emailVerifiedAt: u.emailVerifiedAt
				}
			};
			return [toSession(session.get({ plain: true })), databaseUser];
		},
		async getUserSessions(userId) {
			const rows = await Session.findAll({ where: { userId } });
			return rows.map((r) => toSession(r.get({ plain: true })));
		},
		async setSession(session) {
			await Session.create({
				id: session.id,
				userId: session.userId,
				expiresAt: session.expiresAt
			});
		},
		async updateSessionExpiration(sessionId, expiresAt) {
			await Session.update({ expiresAt }, { where: { id: sessionId } });
		},
		async deleteSession(sessionId) {
			await Session.destroy({ where: { id: sessionId } });
		},
		async deleteUserSessions(userId) {
			await Session.destroy({ where: { userId } });
		},
		async deleteExpiredSessions() {
			await Session.destroy({ where: { expiresAt: { [Op.lte]: new Date() } } });
		}
	};
}

export function createLucia(database: Database, secure: boolean) {
	return new Lucia(sequelizeAdapter(database), {
		sessionExpiresIn: new TimeSpan(14, 'd'),
		sessionCookie: { name: 'rankseal_session', attributes: { secure, sameSite: 'lax' } },
		getUserAttributes: (a): Omit<SessionUser, 'id'> => ({
			email: a.email,
			name: a.name,
			accountRole: a.accountRole,
			emailVerified: a.emailVerifiedAt !== null
		})
	});
}

export type AppLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
	interface Register {
		Lucia: AppLucia;
		DatabaseUserAttributes: {
			email: string;
			name: string;
			accountRole: AccountRole;
			emailVerifiedAt: Date | null;
		};
	}
}

export const hashPassword = (password: string) =>
	hash(password, { memoryCost: 19456, timeCost: 2, parallelism: 1 });
export const verifyPassword = (passwordHash: string, password: string) =>
	verify(passwordHash, password);
