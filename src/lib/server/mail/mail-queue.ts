/**
 * Writing mail: a row in the outbox, inside the transaction of the event that causes it, so the
 * message exists exactly when the event does. The sender (../mail-sender.ts) delivers it later;
 * no request waits on a mail server.
 */
import { Op, type Transaction } from 'sequelize';
import type { Database } from '../db';
import { rateLimitRules } from '../core/rate-limits';
import { renderTemplate, type MailTemplate, type RenderedMail } from './templates';
import { newId } from '../core/ids';

type Listener = () => void;
const listeners = new Set<Listener>();

/** Called after a transaction that queued mail commits (the running app wakes its sender). */
export function onMailQueued(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}

const notify = () => listeners.forEach((listener) => listener());

/**
 * Why a message to this recipient is held back, or null: every route's mail passes here, so no
 * route can flood one inbox. Held messages are kept (and shown to admins), never sent by themselves.
 */
async function capReached(
	database: Database,
	transaction: Transaction,
	to: string
): Promise<string | null> {
	const { points, windowSeconds } = rateLimitRules().mailPerRecipient;
	const since = new Date(Date.now() - windowSeconds * 1000);
	const recent = await database.models.OutboxMail.count({
		where: { to, status: { [Op.ne]: 'held' }, createdAt: { [Op.gt]: since } },
		transaction
	});
	if (recent < points) return null;
	const span = windowSeconds % 3600 === 0 ? `${windowSeconds / 3600} h` : `${windowSeconds} s`;
	return `held back: this address already had ${recent} messages in the last ${span} (at most ${points}).`;
}

/**
 * Stores an already rendered message as queued (or held, past the per-recipient cap), in the
 * event's transaction; returns its id.
 */
export async function queueRendered(
	database: Database,
	transaction: Transaction,
	to: string,
	kind: string,
	mail: RenderedMail
): Promise<string> {
	const id = newId();
	const held = await capReached(database, transaction, to);
	const status = held ? 'held' : 'queued';
	await database.models.OutboxMail.create(
		{
			...{ id, kind, to, ...mail, status, attempts: 0 },
			...{ nextAttemptAt: held ? null : new Date(), lastError: held, sentAt: null }
		},
		{ transaction }
	);
	if (!held) transaction.afterCommit(notify);
	return id;
}

/** Renders the template (text and HTML) and queues it. */
export const queueMail = (
	database: Database,
	transaction: Transaction,
	to: string,
	template: MailTemplate,
	values: Record<string, string>
): Promise<string> =>
	queueRendered(database, transaction, to, template, renderTemplate(template, values));
