/** The local mail catcher's messages, for admins (the outbox pages). */
import type { Actor } from '../access/actor';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import { NotFoundError } from './errors';

export interface OutboxItem {
	id: string;
	from: string;
	to: string;
	subject: string;
	createdAt: string;
}

export interface OutboxMessage extends OutboxItem {
	text: string;
}

export const OUTBOX_PAGE_SIZE = 50;

export async function listOutbox(
	database: Database,
	actor: Actor,
	page = 1
): Promise<{ items: OutboxItem[]; total: number; page: number; pageSize: number }> {
	await requireService(database, actor, 'read-outbox');
	const current = Math.max(1, Math.floor(page) || 1);
	const { rows, count } = await database.models.MailMessage.findAndCountAll({
		attributes: ['id', 'from', 'to', 'subject', 'createdAt'],
		order: [['createdAt', 'DESC']],
		limit: OUTBOX_PAGE_SIZE,
		offset: (current - 1) * OUTBOX_PAGE_SIZE
	});
	const items = rows.map((row) => {
		const m = row.get({ plain: true });
		return {
			id: m.id,
			from: m.from,
			to: m.to,
			subject: m.subject,
			createdAt: new Date(m.createdAt!).toISOString()
		};
	});
	return { items, total: count, page: current, pageSize: OUTBOX_PAGE_SIZE };
}

export async function getOutboxMessage(
	database: Database,
	actor: Actor,
	id: string
): Promise<OutboxMessage> {
	await requireService(database, actor, 'read-outbox');
	const row = await database.models.MailMessage.findByPk(id);
	if (!row) throw new NotFoundError('No such message.');
	const m = row.get({ plain: true });
	return {
		id: m.id,
		from: m.from,
		to: m.to,
		subject: m.subject,
		text: m.text,
		createdAt: new Date(m.createdAt!).toISOString()
	};
}
