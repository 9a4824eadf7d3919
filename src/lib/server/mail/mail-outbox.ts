/** The outbox for admins: every message Rankseal wrote, with its delivery status. */
import { MAX_PAGE } from '$lib/paging';
import { Op, col, fn, where as sqlWhere } from 'sequelize';
import type { Actor } from '../core/actor';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import { redactSecretLinks } from './mail-redact';
import type { OutboxMailAttributes, OutboxStatus } from '../db/models/OutboxMail';
import { ConflictError, NotFoundError } from '../core/errors';

export interface OutboxItem {
	id: string;
	kind: string;
	to: string;
	subject: string;
	status: OutboxStatus;
	attempts: number;
	nextAttemptAt: string | null;
	lastError: string | null;
	sentAt: string | null;
	createdAt: string;
}

export interface OutboxMessage extends OutboxItem {
	text: string;
	html: string;
}

export const OUTBOX_PAGE_SIZE = 50;

/** In place of a link that opens something (an account, an invitation, a share, a review). */
const HIDDEN_LINK = '[link hidden: it opens something for its recipient]';

const iso = (date: Date | null | undefined) => (date ? new Date(date).toISOString() : null);

function item(m: OutboxMailAttributes): OutboxItem {
	return {
		id: m.id,
		kind: m.kind,
		to: m.to,
		subject: m.subject,
		status: m.status,
		attempts: m.attempts,
		nextAttemptAt: iso(m.nextAttemptAt),
		lastError: m.lastError,
		sentAt: iso(m.sentAt),
		createdAt: iso(m.createdAt)!
	};
}

export async function listOutbox(
	database: Database,
	actor: Actor,
	page = 1,
	status: OutboxStatus | null = null
): Promise<{ items: OutboxItem[]; total: number; page: number; pageSize: number }> {
	await requireService(database, actor, 'read-outbox');
	const current = Math.min(MAX_PAGE, Math.max(1, Math.floor(page) || 1));
	const { rows, count } = await database.models.OutboxMail.findAndCountAll({
		attributes: { exclude: ['text', 'html'] },
		where: status ? { status } : {},
		order: [['createdAt', 'DESC']],
		limit: OUTBOX_PAGE_SIZE,
		offset: (current - 1) * OUTBOX_PAGE_SIZE
	});
	const items = rows.map((row) => item(row.get({ plain: true })));
	return { items, total: count, page: current, pageSize: OUTBOX_PAGE_SIZE };
}

/** The local catcher's copy of a delivered message, found by the Message-ID the sender gave it. */
async function caughtCopy(database: Database, id: string) {
	const where = sqlWhere(fn('instr', col('raw'), `<${id}@`), Op.gt, 0);
	const row = await database.models.MailMessage.findOne({ where });
	return row ? { text: row.get('text') as string, html: (row.get('html') as string) ?? '' } : null;
}

/**
 * One message with its bodies. With a real mail server, secret links are hidden from admins (and
 * gone from a sent message's stored copy anyway); with the local catcher (development, demo) the
 * outbox is the only inbox, so they show, a delivered message's from the catcher's copy.
 */
export async function getOutboxMessage(
	database: Database,
	actor: Actor,
	id: string,
	options: { revealSecretLinks: boolean } = { revealSecretLinks: true }
): Promise<OutboxMessage> {
	await requireService(database, actor, 'read-outbox');
	const row = await database.models.OutboxMail.findByPk(id);
	if (!row) throw new NotFoundError('No such message.');
	const m = row.get({ plain: true });
	if (!options.revealSecretLinks) return { ...item(m), ...redactSecretLinks(m, HIDDEN_LINK) };
	const caught = m.status === 'sent' ? await caughtCopy(database, m.id) : null;
	return { ...item(m), ...(caught ?? { text: m.text, html: m.html }) };
}

/** Sends a given-up or held-back message from the next pass of the sender. */
export async function requeueOutboxMessage(
	database: Database,
	actor: Actor,
	id: string
): Promise<void> {
	await requireService(database, actor, 'read-outbox');
	const [changed] = await database.models.OutboxMail.update(
		{ status: 'retrying', nextAttemptAt: new Date() },
		{ where: { id, status: { [Op.in]: ['failed', 'held'] } } }
	);
	if (changed === 0) {
		if (!(await database.models.OutboxMail.findByPk(id)))
			throw new NotFoundError('No such message.');
		throw new ConflictError('Only a message that was given up or held back can be queued again.');
	}
}
