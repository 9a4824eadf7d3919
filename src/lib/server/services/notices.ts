/**
 * Notices about sharing and review (claim shared, report filed, report released). Every one goes
 * through sendNotice, so that moving them onto a transactional outbox changes one function.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { Mailer } from '../mail';
import { fillPlaceholders, renderTemplate, type NoticeTemplate } from '../templates';

const htmlSources = import.meta.glob('/templates/mail/notice-*.html', {
	query: '?raw',
	import: 'default',
	eager: true
}) as Record<string, string>;

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
	mailer: Mailer;
	/** The transaction of the event, for an outbox; today mail leaves after it commits. */
	transaction?: Transaction;
}

/** Breaks what a mail reader would turn into a link (dots, @, colons, slashes) in user words. */
export function defuseLinks(words: string): string {
	return words
		.replace(/\./g, '\u2024')
		.replace(/@/g, '\uFF20')
		.replace(/:/g, '\u02D0')
		.replace(/\//g, '\u2215');
}

const escapeHtml = (value: string): string =>
	value.replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!
	);

/** The subject, text and HTML of a notice, with user words defused and escaped. */
export function renderNotice(notice: Notice): { subject: string; text: string; html: string } {
	const words = Object.fromEntries(
		Object.entries(notice.words).map(([key, value]) => [key, defuseLinks(value)])
	);
	const { subject, text } = renderTemplate(notice.template, { ...words, link: notice.link });
	const source = htmlSources[`/templates/mail/${notice.template}.html`];
	if (source === undefined) throw new Error(`mail template ${notice.template}.html is missing`);
	const escaped = Object.fromEntries(
		Object.entries({ ...words, link: notice.link }).map(([k, v]) => [k, escapeHtml(v)])
	);
	return { subject, text, html: fillPlaceholders(source, escaped) };
}

/**
 * Sends one notice. A failed delivery is logged, not thrown: the event has happened and the
 * editor's or author's page shows it either way.
 */
export async function sendNotice(context: NoticeContext, notice: Notice): Promise<boolean> {
	const mail = renderNotice(notice);
	try {
		await context.mailer.send({ to: notice.to, ...mail });
		return true;
	} catch (error) {
		console.error(`mail: could not send "${notice.template}" to ${notice.to}:`, error);
		return false;
	}
}
