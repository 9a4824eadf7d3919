/**
 * Every notice mail carries the ledger checkpoint current when it was written (inside the
 * event's transaction, so it counts the event's own ledger entries): a reader who keeps it can
 * later show that the ledger was cut short (ledger:verify --checkpoint, /seal).
 */
import type { Transaction } from 'sequelize';
import { describeCheckpoint, type LedgerCheckpoint } from '../../evidence/checkpoint';
import type { Database } from '../db';
import { escapeHtml, type RenderedMail } from './templates';
import { currentCheckpoint, publishCheckpoint } from '../ledger/ledger-checkpoint';

/** The checkpoint as of this transaction; it is remembered as published once the event commits. */
export async function noticeCheckpoint(
	database: Database,
	transaction: Transaction
): Promise<LedgerCheckpoint> {
	const checkpoint = await currentCheckpoint(database, transaction);
	transaction.afterCommit(() => void publishCheckpoint(database));
	return checkpoint;
}

const INTRO =
	'The public ledger when this notice was written (keep this line to check later that no entry was removed):';

/** The mail with the checkpoint as one line of JSON at the end of the text and the HTML. */
export function withCheckpoint(mail: RenderedMail, checkpoint: LedgerCheckpoint): RenderedMail {
	const line = JSON.stringify(checkpoint);
	const text = `${mail.text.trimEnd()}\n\n${INTRO}\n${describeCheckpoint(checkpoint)}\n${line}\n`;
	const block =
		`<p style="margin-top: 24px; color: #4b5060; font-size: 12px">${escapeHtml(INTRO)}<br />` +
		`<code style="word-break: break-all">${escapeHtml(line)}</code></p>`;
	const at = mail.html.lastIndexOf('</body>');
	const html = at < 0 ? mail.html + block : mail.html.slice(0, at) + block + mail.html.slice(at);
	return { ...mail, text, html };
}
