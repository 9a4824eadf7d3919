/**
 * fidelity-target claims whose λ is fitted on a separate calibration run (witnesses.md §4.3′, §9):
 * where λ comes from, and once the run is uploaded, the run as given, its SHA-256 and the fit.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('claims', 'target_source', { type: DataTypes.STRING, allowNull: true });
	await q.addColumn('claims', 'target_run', { type: DataTypes.BLOB, allowNull: true });
	await q.addColumn('claims', 'target_run_sha256', { type: DataTypes.STRING(64), allowNull: true });
	await q.addColumn('claims', 'target_run_name', { type: DataTypes.STRING, allowNull: true });
	await q.addColumn('claims', 'target_fit', { type: DataTypes.TEXT, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	for (const column of ['target_fit', 'target_run_name', 'target_run_sha256', 'target_run'])
		await q.removeColumn('claims', column);
	await q.removeColumn('claims', 'target_source');
}
