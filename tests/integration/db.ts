/** A fresh SQLite database in a temporary folder, for service tests against the real thing. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { openDatabase, type Database } from '../../src/lib/server/db';

export async function temporaryDatabase(): Promise<{
	database: Database;
	folder: string;
	close: () => Promise<void>;
}> {
	const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-test-'));
	const database = await openDatabase(path.join(folder, 'rankseal.sqlite'));
	return {
		database,
		folder,
		close: async () => {
			await database.sequelize.close();
			rmSync(folder, { recursive: true, force: true });
		}
	};
}
