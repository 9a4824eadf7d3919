import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import { actedAs } from './acting';
import { newId } from './ids';

export interface AuditEntry {
	actorId: string | null;
	groupId?: string | null;
	action: string;
	subjectType: string;
	subjectId?: string | null;
	details?: Record<string, unknown>;
}

/** Appends one audit event, inside the caller's transaction when given. */
export async function audit(
	database: Database,
	entry: AuditEntry,
	transaction?: Transaction
): Promise<void> {
	const how = actedAs();
	const details = how ? { actedAs: how, ...entry.details } : (entry.details ?? {});
	await database.models.AuditEvent.create(
		{ id: newId(), groupId: null, subjectId: null, ...entry, details },
		{ transaction }
	);
}
