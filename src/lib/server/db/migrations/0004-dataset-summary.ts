/**
 * Datasets keep their heat-map tables, written when the file is read at upload, so that a page
 * view does not parse the file; older rows get theirs the first time a page shows them. Checks
 * record whether accidentals were subtracted (false for every earlier check).
 */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('datasets', 'preview', { type: DataTypes.JSON, allowNull: true });
	await q.addColumn('checks', 'subtract_accidentals', {
		type: DataTypes.BOOLEAN,
		allowNull: false,
		defaultValue: false
	});
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('checks', 'subtract_accidentals');
	await q.removeColumn('datasets', 'preview');
}
