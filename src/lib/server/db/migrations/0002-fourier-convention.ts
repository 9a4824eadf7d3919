/**
 * The claim's Fourier convention (issue 6 §5): `cyclic` (the ℤ_d transform, the new default) or
 * `field` (the GF(p^s) basis). Claims made before this migration were computed with the field
 * basis wherever d = p^s with s ≥ 2, so they keep that meaning ('field'); for prime d the two
 * conventions are the same bases and for other d only the cyclic one exists, so those get 'cyclic'.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

/** Every d = p^s with s ≥ 2 up to the engine's limit of 256, written out so this file never moves. */
const FIELD_DIMENSIONS = [4, 8, 9, 16, 25, 27, 32, 49, 64, 81, 121, 125, 128, 169, 243, 256];

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('claims', 'fourier', {
		type: DataTypes.STRING,
		allowNull: false,
		defaultValue: 'cyclic'
	});
	await q.sequelize.query(
		`UPDATE claims SET fourier = 'field' WHERE dimension IN (${FIELD_DIMENSIONS.join(', ')})`
	);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('claims', 'fourier');
}
