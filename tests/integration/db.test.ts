import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrations } from '../../src/lib/server/db/migrations';
import { temporaryDatabase } from './db';

describe('database', () => {
	let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
	beforeAll(async () => (ctx = await temporaryDatabase()));
	afterAll(async () => ctx.close());

	it('runs the migrations on a new file, in WAL mode with foreign keys on', async () => {
		const select = (sql: string) => ctx.database.sequelize.query(sql, { type: QueryTypes.SELECT });
		expect(await select('PRAGMA journal_mode;')).toEqual([{ journal_mode: 'wal' }]);
		expect(await select('PRAGMA foreign_keys;')).toEqual([{ foreign_keys: 1 }]);
		const applied = await select('SELECT name FROM schema_migrations ORDER BY name');
		expect(applied).toEqual(migrations.map(({ name }) => ({ name })));
		// Registered in number order, none missing (a name sorted out of place would fail above).
		expect(migrations.map((m) => m.name)).toEqual([
			'0001-initial',
			'0002-fourier-convention',
			'0003-token-expiry',
			'0004-dataset-summary',
			'0005-certificates',
			'0006-sharing-review',
			'0007-outbox-archive',
			'0008-check-fair-use',
			'0009-mail-cap',
			'0010-check-attempts',
			'0011-analyses',
			'0012-ledger-key-entries',
			'0014-no-live-secrets',
			'0015-share-opened',
			'0016-dataset-calibration',
			'0018-trials-claims',
			'0020-target-claims',
			'0021-certificate-dois',
			'0022-orcid-ids',
			'0024-counts-advice',
			'0025-target-runs'
		]);
	});

	it('rejects a membership that points at no user (foreign keys enforced)', async () => {
		const { Group, Membership } = ctx.database.models;
		await Group.create({ id: 'g1', name: 'Test group' });
		await expect(
			Membership.create({ id: 'm1', groupId: 'g1', userId: 'nobody', role: 'author' })
		).rejects.toThrow(/FOREIGN KEY/);
	});
});
