/**
 * No live secret at rest (issue 16 part 5). Sessions are now stored as the SHA-256 of their id,
 * so the ones stored as the cookie's value are dropped (everyone signs in again). Delivered and
 * given-up mail loses its secret links, as the sender now does for every later message.
 */
import { QueryTypes, type QueryInterface } from 'sequelize';
import { redactSecretLinks } from '../../mail/mail-redact';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.bulkDelete('sessions', {});
	const rows = await q.sequelize.query<{ id: string; text: string; html: string }>(
		"SELECT id, text, html FROM outbox_mails WHERE status IN ('sent', 'failed')",
		{ type: QueryTypes.SELECT }
	);
	for (const row of rows) {
		const redacted = redactSecretLinks(row);
		if (redacted.text === row.text && redacted.html === row.html) continue;
		await q.bulkUpdate('outbox_mails', redacted, { id: row.id });
	}
}

/** Dropped sessions and removed links cannot come back; nothing to undo. */
export async function down() {}
