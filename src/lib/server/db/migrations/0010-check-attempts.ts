/** Starts per check: one that keeps cutting the server short is failed, not re-queued forever. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('checks', 'attempts', {
		type: DataTypes.INTEGER,
		allowNull: false,
		defaultValue: 0
	});
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('checks', 'attempts');
}
