/**
 * Notices about sharing and review (claim shared, report filed, report released). Every one goes
 * through sendNotice, which writes it to the mail outbox; the background sender delivers it.
 */
import type { Transaction } from 'sequelize';
import { writeTransaction, type Database } from '../db';
import type { Mailer } from './mail';
import { renderTemplate, type NoticeTemplate } from './templates';
import { queueRendered } from './mail-queue';
import { noticeCheckpoint, withCheckpoint } from './notice-checkpoint';

export interface Notice {
	template: NoticeTemplate;
	to: string;
	/** The one link of the notice; the only value that may carry a secret. */
	link: string;
	/** Words chosen by users (names, titles, journals): shown, never turned into links. */
	words: Record<string, string>;
}

export interface NoticeContext {
	database: Database;
	/** Kept for callers' symmetry with the other mail helpers; the outbox needs no transport. */
	mailer?: Mailer;
	/** The event's transaction: the notice then exists exactly when the event does. */
	transaction?: Transaction;
}

/** Queues one notice (rendered text and HTML, user words defused) and returns its outbox id. */
export async function sendNotice(context: NoticeContext, notice: Notice): Promise<string> {
	const mail = renderTemplate(notice.template, { ...notice.words, link: notice.link });
	const queue = async (transaction: Transaction) => {
		const checkpoint = await noticeCheckpoint(context.database, transaction);
		const stamped = withCheckpoint(mail, checkpoint);
		return queueRendered(context.database, transaction, notice.to, notice.template, stamped);
	};
	return context.transaction
		? queue(context.transaction)
		: writeTransaction(context.database, queue);
}
