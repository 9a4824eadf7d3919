/** `fidelity-target` claims (witnesses.md §4.3′): the declared λ (Σλ² = 1) and, when scaled, λ as declared. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('claims', 'target', { type: DataTypes.TEXT, allowNull: true });
	await q.addColumn('claims', 'target_declared', { type: DataTypes.TEXT, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('claims', 'target_declared');
	await q.removeColumn('claims', 'target');
}
