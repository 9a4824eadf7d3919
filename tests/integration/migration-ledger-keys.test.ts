/**
 * Migration 0012 rebuilds ledger_entries so that a key introduction may name no certificate:
 * every row survives unchanged, and the primary key, the unique hash, the foreign key to
 * certificates and the certificate_id index are all still there.
 */
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as ledgerKeys from '../../src/lib/server/db/migrations/0012-ledger-key-entries';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling and issuing on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
const select = <T extends object = object>(sql: string) =>
	world.database.sequelize.query<T>(sql, { type: QueryTypes.SELECT });
const schema = async () => ({
	columns: await select<{ name: string; notnull: number; pk: number }>(
		'SELECT name, "notnull", pk FROM pragma_table_info(\'ledger_entries\')'
	),
	foreign: await select(
		'SELECT "from", "table", "to", on_delete FROM pragma_foreign_key_list(\'ledger_entries\')'
	),
	indexes: await select<{ name: string; unique: number }>(
		'SELECT name, "unique" FROM pragma_index_list(\'ledger_entries\') ORDER BY name'
	)
});

beforeAll(async () => {
	world = await evidenceWorld();
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(world.ctx.folder, 'verify.mjs'));
	for (const seed of [71, 72])
		await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			(await finishedCheck(world, seed)).id
		);
});
afterAll(() => world.ctx.close());

describe('migration 0012-ledger-key-entries', () => {
	it('keeps every row and constraint, and only relaxes certificate_id to nullable', async () => {
		const q = world.database.sequelize.getQueryInterface();
		const rowsAfter = await select('SELECT * FROM ledger_entries ORDER BY seq');
		const after = await schema();
		await ledgerKeys.down({ context: q });
		const before = await schema();
		expect(await select('SELECT * FROM ledger_entries ORDER BY seq')).toEqual(rowsAfter);
		await ledgerKeys.up({ context: q });
		expect(await schema()).toEqual(after);
		expect(await select('SELECT * FROM ledger_entries ORDER BY seq')).toEqual(rowsAfter);
		const nullable = (s: typeof after) =>
			s.columns.find((c) => c.name === 'certificate_id')!.notnull;
		expect([nullable(before), nullable(after)]).toEqual([1, 0]);
		expect(after.foreign).toEqual(before.foreign);
		expect(after.foreign).toEqual([
			{ from: 'certificate_id', table: 'certificates', to: 'id', on_delete: 'RESTRICT' }
		]);
		expect(after.indexes.map((i) => [i.name, i.unique])).toEqual([
			['ledger_entries_certificate_id', 0],
			['sqlite_autoindex_ledger_entries_1', 1]
		]);
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true, entries: 3 });
	});
});
