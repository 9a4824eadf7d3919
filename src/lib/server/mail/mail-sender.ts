/**
 * The background sender: delivers outbox rows that are due, one at a time, and records each
 * outcome. A row is claimed (queued/retrying → sending) by a conditional update before it is
 * sent and marked sent only after the SMTP server accepted it, so each row is sent once. A
 * process that stops between the server's acceptance and the mark leaves the row `sending`;
 * the next start sends it again with the same Message-ID (the one duplicate possible). Once sent
 * or given up, the stored copy keeps no working secret link (mail-redact.ts).
 */
import { dueRowsQuery } from '../core/outbox-due';
import type { Database } from '../db';
import type { OutboxMailAttributes } from '../db/models/OutboxMail';
import type { Mailer } from './mail';
import { redactSecretLinks } from './mail-redact';

/** Attempts before a message is given up (an admin may queue it again). */
export const MAX_ATTEMPTS = 12;
const FIRST_RETRY_MS = 30_000;
const LONGEST_RETRY_MS = 60 * 60_000;

/** The wait after the n-th failed attempt: 30 s, 1 min, 2 min, … at most 1 h (~6 h in all). */
export const retryDelayMs = (failedAttempts: number): number =>
	Math.min(LONGEST_RETRY_MS, FIRST_RETRY_MS * 2 ** Math.max(0, failedAttempts - 1));

export interface DeliveryReport {
	sent: string[];
	failed: string[];
}

const messageId = (id: string, origin: string) =>
	`<${id}@${new URL(origin).hostname || 'rankseal.invalid'}>`;

async function claim(database: Database, row: OutboxMailAttributes): Promise<boolean> {
	const [changed] = await database.models.OutboxMail.update(
		{ status: 'sending', attempts: row.attempts + 1 },
		{ where: { id: row.id, status: row.status, attempts: row.attempts } }
	);
	return changed === 1;
}

async function attempt(database: Database, mailer: Mailer, row: OutboxMailAttributes, now: Date) {
	const { OutboxMail } = database.models;
	const attempts = row.attempts + 1;
	try {
		const { to, subject, text, html } = row;
		await mailer.send({ to, subject, text, html, messageId: messageId(row.id, mailer.origin) });
	} catch (error) {
		const reason = (error instanceof Error ? error.message : String(error)).slice(0, 500);
		const givenUp = attempts >= MAX_ATTEMPTS;
		const nextAttemptAt = givenUp ? null : new Date(now.getTime() + retryDelayMs(attempts));
		const status = givenUp ? 'failed' : 'retrying';
		const bodies = givenUp ? redactSecretLinks(row) : {};
		await OutboxMail.update(
			{ status, nextAttemptAt, lastError: reason, ...bodies },
			{ where: { id: row.id } }
		);
		return false;
	}
	const done = {
		status: 'sent' as const,
		sentAt: new Date(),
		nextAttemptAt: null,
		lastError: null,
		...redactSecretLinks(row)
	};
	await OutboxMail.update(done, { where: { id: row.id } });
	return true;
}

/**
 * Sends every message due at `now` (queued, or retrying with its next try at or before `now`),
 * oldest first. Tests call this directly; the app calls it from its timer.
 */
export async function deliverDue(
	database: Database,
	mailer: Mailer,
	now: Date = new Date(),
	keepGoing: () => boolean = () => true
): Promise<DeliveryReport> {
	const report: DeliveryReport = { sent: [], failed: [] };
	const due = await database.models.OutboxMail.findAll(dueRowsQuery(now));
	for (const found of due) {
		if (!keepGoing()) break;
		const row = found.get({ plain: true });
		if (!(await claim(database, row))) continue;
		((await attempt(database, mailer, row, now)) ? report.sent : report.failed).push(row.id);
	}
	return report;
}

/** Rows a stopped process left `sending`: due again now (see the header for the duplicate). */
export async function resumeInterrupted(
	database: Database,
	now: Date = new Date()
): Promise<number> {
	const [changed] = await database.models.OutboxMail.update(
		{ status: 'retrying', nextAttemptAt: now, lastError: 'interrupted by a restart' },
		{ where: { status: 'sending' } }
	);
	return changed;
}
