/**
 * rankseal keys:rotate — makes a new service signing key, makes it current and introduces it on
 * the ledger by an entry signed with the key before it. Earlier keys stay listed (and keep
 * verifying the certificates they signed).
 *   npm run --silent keys:rotate
 */
import { existsSync } from 'node:fs';
import { config } from '../lib/server/core/config';
import { openDatabase, writeTransaction } from '../lib/server/db';
import { publishedKeys, rotateServiceKey } from '../lib/server/evidence/keys';
import { introduceKeys } from '../lib/server/ledger/key-introductions';

/** The ledger entry number of the introduction, or why there is none yet. */
async function introduce(): Promise<string> {
	const { databasePath } = config();
	if (!existsSync(databasePath)) return 'no database yet: the first ledger entry will name it';
	const database = await openDatabase(databasePath);
	try {
		const introduced = await writeTransaction(database, (t) => introduceKeys(database, t));
		if (introduced.length === 0) return 'the ledger is empty: its first entry will name it';
		const newest = await database.models.LedgerEntry.max('seq');
		return `introduced on the ledger (entry ${newest}), signed with the previous key`;
	} finally {
		await database.sequelize.close();
	}
}

async function main() {
	const before = publishedKeys().at(-1)!;
	const key = rotateServiceKey();
	console.log(`signing key rotated: ${before.id} -> ${key.id}`);
	console.log(await introduce());
	console.log(`${publishedKeys().length} keys listed; certificates signed earlier stay valid.`);
}

main().catch((error) => {
	console.error(`keys:rotate failed: ${(error as Error).message}`);
	process.exitCode = 1;
});
