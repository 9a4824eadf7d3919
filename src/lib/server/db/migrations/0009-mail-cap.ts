/** The per-recipient mail cap counts an address's recent letters: an index makes that one seek. */
import type { QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addIndex('outbox_mails', ['to', 'created_at'], { name: 'outbox_mails_to_created_at' });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeIndex('outbox_mails', 'outbox_mails_to_created_at');
}
