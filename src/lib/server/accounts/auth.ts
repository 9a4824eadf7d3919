/**
 * Sign-in sessions through lucia 3 with a Sequelize adapter, and Argon2id password hashes
 * (@node-rs/argon2's default algorithm). The sessions table holds each id's SHA-256, never the
 * cookie's value: the adapter hashes on every write and look-up, so a copy of the database
 * (a backup) opens no session.
 */
import { hash, verify } from '@node-rs/argon2';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { Op } from 'sequelize';
import { sha256Hex } from '$lib/evidence/hash';
import type { Database } from '../db';
import type { AccountRole } from '../db/models/User';

export interface SessionUser {
	id: string;
	email: string;
	name: string;
	accountRole: AccountRole;
	emailVerified: boolean;
}

/** What the sessions table stores for a session id (the cookie's value). */
export const sessionKey = (sessionId: string): string => sha256Hex(sessionId);

function sequelizeAdapter(database: Database): Adapter {
	const { Session, User } = database.models;
	/** `id` is the cookie's value where the caller knows it; getUserSessions only has the hash. */
	const toSession = (
		row: { id: string; userId: string; expiresAt: Date },
		id = row.id
	): DatabaseSession => ({
		id,
		userId: row.userId,
		expiresAt: new Date(row.expiresAt),
		attributes: {}
	});
	return {
		async getSessionAndUser(sessionId) {
			const session = await Session.findByPk(sessionKey(sessionId));
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
			return [toSession(session.get({ plain: true }), sessionId), databaseUser];
		},
		async getUserSessions(userId) {
			const rows = await Session.findAll({ where: { userId } });
			return rows.map((r) => toSession(r.get({ plain: true })));
		},
		async setSession(session) {
			await Session.create({
				id: sessionKey(session.id),
				userId: session.userId,
				expiresAt: session.expiresAt
			});
		},
		async updateSessionExpiration(sessionId, expiresAt) {
			await Session.update({ expiresAt }, { where: { id: sessionKey(sessionId) } });
		},
		async deleteSession(sessionId) {
			await Session.destroy({ where: { id: sessionKey(sessionId) } });
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
