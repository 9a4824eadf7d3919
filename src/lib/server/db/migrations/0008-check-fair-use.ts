/** Fair use of the workers: a check remembers the review link that started it, and who cancelled it. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('checks', 'review_link_id', { type: DataTypes.STRING, allowNull: true });
	await q.addColumn('checks', 'cancelled_at', { type: DataTypes.DATE, allowNull: true });
	await q.addColumn('checks', 'cancelled_by', { type: DataTypes.STRING, allowNull: true });
	// The limits count a person's and a group's queued and running checks on every start.
	await q.addIndex('checks', ['status', 'created_by']);
	await q.addIndex('checks', ['status', 'claim_id']);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeIndex('checks', ['status', 'claim_id']);
	await q.removeIndex('checks', ['status', 'created_by']);
	await q.removeColumn('checks', 'cancelled_by');
	await q.removeColumn('checks', 'cancelled_at');
	await q.removeColumn('checks', 'review_link_id');
}
