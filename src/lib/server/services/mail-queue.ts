/**
 * Writing mail: a row in the outbox, inside the transaction of the event that causes it, so the
 * message exists exactly when the event does. The sender (../mail-sender.ts) delivers it later;
 * no request waits on a mail server.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import { renderTemplate, type MailTemplate, type RenderedMail } from '../templates';
import { newId } from './ids';

type Listener = () => void;
const listeners = new Set<Listener>();

/** Called after a transaction that queued mail commits (the running app wakes its sender). */
export function onMailQueued(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}

const notify = () => listeners.forEach((listener) => listener());

/** Stores an already rendered message as queued, in the event's transaction; returns its id. */
export async function queueRendered(
	database: Database,
	transaction: Transaction,
	to: string,
	kind: string,
	mail: RenderedMail
): Promise<string> {
	const id = newId();
	await database.models.OutboxMail.create(
		{
			id,
			kind,
			to,
			...mail,
			status: 'queued',
			attempts: 0,
			nextAttemptAt: new Date(),
			lastError: null,
			sentAt: null
		},
		{ transaction }
	);
	transaction.afterCommit(notify);
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
