/**
 * Migration 0002 on claims made before it (issue 6 §5): d = p^s with s ≥ 2 keeps the field
 * basis it was computed with; prime d and other d become cyclic.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { QueryTypes, Sequelize } from 'sequelize';
import sqlite3 from 'sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import * as initial from '../../src/lib/server/db/migrations/0001-initial';
import * as fourier from '../../src/lib/server/db/migrations/0002-fourier-convention';

describe('migration 0002-fourier-convention', () => {
	const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-migration-'));
	const sequelize = new Sequelize({
		dialect: 'sqlite',
		dialectModule: sqlite3,
		storage: path.join(folder, 'old.sqlite'),
		logging: false
	});
	afterAll(async () => {
		await sequelize.close();
		rmSync(folder, { recursive: true, force: true });
	});

	it('marks existing claims in d = 4, 8, 9, 16, 25, 27, 256 field and the rest cyclic', async () => {
		const q = sequelize.getQueryInterface();
		await initial.up({ context: q });
		const now = new Date().toISOString();
		await sequelize.query(
			`INSERT INTO users (id, email, name, password_hash, created_at, updated_at) VALUES ('u', 'u@x.example', 'U', 'h', '${now}', '${now}')`
		);
		await sequelize.query(
			`INSERT INTO groups (id, name, created_at, updated_at) VALUES ('g', 'G', '${now}', '${now}')`
		);
		const dimensions = [2, 3, 4, 5, 6, 7, 8, 9, 10, 12, 16, 25, 27, 31, 256];
		for (const d of dimensions)
			await sequelize.query(
				`INSERT INTO claims (id, group_id, created_by, title, source_description, dimension, method, bases, claimed_schmidt_number, created_at, updated_at)
				 VALUES ('c${d}', 'g', 'u', 't', 's', ${d}, 'mub-correlation', '[0,1]', 2, '${now}', '${now}')`
			);
		await fourier.up({ context: q });
		const rows = await sequelize.query<{ dimension: number; fourier: string }>(
			'SELECT dimension, fourier FROM claims ORDER BY dimension',
			{ type: QueryTypes.SELECT }
		);
		// Prime powers p^s with s ≥ 2 (common practice: 4 = 2², 8 = 2³, 9 = 3², …, 256 = 2⁸).
		const field = new Set([4, 8, 9, 16, 25, 27, 256]);
		expect(rows).toEqual(
			dimensions.map((d) => ({ dimension: d, fourier: field.has(d) ? 'field' : 'cyclic' }))
		);
	});
});
