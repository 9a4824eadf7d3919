/** A dataset may carry the measured basis vectors (witnesses.md §4.4), kept as uploaded. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('datasets', 'calibration', { type: DataTypes.BLOB, allowNull: true });
	await q.addColumn('datasets', 'calibration_sha256', {
		type: DataTypes.STRING(64),
		allowNull: true
	});
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('datasets', 'calibration_sha256');
	await q.removeColumn('datasets', 'calibration');
}
