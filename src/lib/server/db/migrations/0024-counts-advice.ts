/** The counts an unsupported claim needs, simulated after its check and kept beside (not in) the result. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('checks', 'counts_advice', { type: DataTypes.JSON, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('checks', 'counts_advice');
}
