/** Claims on time-ordered trials (issue 20): the mode and the declared setting probabilities. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('claims', 'trials_mode', { type: DataTypes.STRING, allowNull: true });
	await q.addColumn('claims', 'trials_probabilities', { type: DataTypes.TEXT, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('claims', 'trials_probabilities');
	await q.removeColumn('claims', 'trials_mode');
}
