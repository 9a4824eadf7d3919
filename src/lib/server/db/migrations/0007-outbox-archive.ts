/** The mail outbox (written with the event, delivered by the background sender) and claim withdrawal. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.createTable('outbox_mails', {
		id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		kind: { type: DataTypes.STRING, allowNull: false },
		to: { type: DataTypes.TEXT, allowNull: false },
		subject: { type: DataTypes.TEXT, allowNull: false },
		text: { type: DataTypes.TEXT, allowNull: false },
		html: { type: DataTypes.TEXT, allowNull: false },
		status: { type: DataTypes.STRING, allowNull: false },
		attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		next_attempt_at: { type: DataTypes.DATE, allowNull: true },
		last_error: { type: DataTypes.TEXT, allowNull: true },
		sent_at: { type: DataTypes.DATE, allowNull: true },
		created_at: { type: DataTypes.DATE, allowNull: false },
		updated_at: { type: DataTypes.DATE, allowNull: false }
	});
	await q.addIndex('outbox_mails', ['status', 'next_attempt_at']);
	await q.addIndex('outbox_mails', ['created_at']);
	await q.addColumn('claims', 'withdrawn_reason', { type: DataTypes.TEXT, allowNull: true });
	await q.addColumn('claims', 'withdrawn_at', { type: DataTypes.DATE, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('claims', 'withdrawn_at');
	await q.removeColumn('claims', 'withdrawn_reason');
	await q.dropTable('outbox_mails');
}
