/** Certificate DOIs (issue 21): the name given at issue and its registration outbox state. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.createTable('certificate_dois', {
		certificate_id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		doi: { type: DataTypes.STRING, allowNull: false, unique: true },
		creators: { type: DataTypes.TEXT, allowNull: false },
		status: { type: DataTypes.STRING, allowNull: false },
		revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
		sent_revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		next_attempt_at: { type: DataTypes.DATE, allowNull: true },
		last_error: { type: DataTypes.TEXT, allowNull: true },
		registered_at: { type: DataTypes.DATE, allowNull: true },
		created_at: { type: DataTypes.DATE, allowNull: false },
		updated_at: { type: DataTypes.DATE, allowNull: false }
	});
	await q.addIndex('certificate_dois', ['status', 'next_attempt_at']);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.dropTable('certificate_dois');
}
