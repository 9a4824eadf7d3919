/**
 * rankseal ledger:verify — checks the whole ledger chain and every certificate row against it.
 *   npm run --silent ledger:verify
 * Exit 0 intact, 1 broken (naming the first broken entry or row).
 */
import { config } from '../lib/server/config';
import { openDatabase } from '../lib/server/db';
import { verifyLedger } from '../lib/server/services/ledger-verify';

async function main(): Promise<number> {
	const database = await openDatabase(config().databasePath);
	try {
		const report = await verifyLedger(database);
		const counted = `${report.entries} ledger entries, ${report.certificates} certificates`;
		if (report.valid) console.log(`ledger intact: ${counted}.`);
		else console.log(`ledger BROKEN at ${report.firstBroken}: ${report.problem} (${counted}).`);
		return report.valid ? 0 : 1;
	} finally {
		await database.sequelize.close();
	}
}

main().then(
	(code) => (process.exitCode = code),
	(error) => {
		console.error(`ledger:verify failed: ${(error as Error).message}`);
		process.exitCode = 1;
	}
);
