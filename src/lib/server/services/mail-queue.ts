/**
 * Writing mail: a row in the outbox, inside the transaction of the event that causes it, so the
 * message exists exactly when the event does. The sender (../mail-sender.ts) delivers it later;
 * no request waits on a mail server.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import { renderTemplate, type MailTemplate } from '../templates';
import { newId } from './ids';

type Listener = () => void;
const listeners = new Set<Listener>();

/** Called after a transaction that queued mail commits (the running app wakes its sender). */
export function onMailQueued(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}

const notify = () => listeners.forEach((listener) => listener());

/** Renders the template (text and HTML) and stores the message as queued; returns its id. */
export async function queueMail(
	database: Database,
	transaction: Transaction,
	to: string,
	template: MailTemplate,
	values: Record<string, string>
): Promise<string> {
	const { subject, text, html } = renderTemplate(template, values);
	const id = newId();
	await database.models.OutboxMail.create(
		{
			id,
			kind: template,
			to,
			subject,
			text,
			html,
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
