/**
 * rankseal ledger:verify — checks the whole ledger chain and every certificate row against it,
 * then that the ledger still reaches the last checkpoint this service published and, with
 * --checkpoint, a checkpoint you kept (a JSON file, or an evidence bundle's zip).
 *   npm run --silent ledger:verify [-- --checkpoint FILE]
 * Exit 0 intact, 1 broken (naming the first broken, missing or changed entry or row).
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { parseCheckpoint, type LedgerCheckpoint } from '../lib/evidence/checkpoint';
import { BUNDLE_FILES } from '../lib/evidence/layout';
import { config } from '../lib/server/core/config';
import { openDatabase, type Database } from '../lib/server/db';
import { readZip } from '../lib/server/evidence/zip-read';
import { rememberedCheckpoint } from '../lib/server/ledger/checkpoint-memory';
import { checkAgainst } from '../lib/server/ledger/ledger-checkpoint';
import { verifyLedger } from '../lib/server/ledger/ledger-verify';

/** A checkpoint from a JSON file, or the checkpoint.json inside an evidence bundle (zip). */
function checkpointFile(file: string): LedgerCheckpoint {
	const bytes = readFileSync(file);
	const zipped = bytes.subarray(0, 4).toString('latin1') === 'PK\x03\x04';
	const text = zipped
		? new TextDecoder().decode(readZip(bytes)[BUNDLE_FILES.checkpoint] ?? new Uint8Array())
		: bytes.toString('utf8');
	const checkpoint = parseCheckpoint(text);
	if (!checkpoint)
		throw new Error(`${file} holds no ledger checkpoint (GET /api/v1/ledger/checkpoint gives one)`);
	return checkpoint;
}

/** The first checkpoint the ledger no longer extends, as "where: problem"; null when none. */
async function firstUnreached(
	database: Database,
	checkpoints: [string, LedgerCheckpoint][]
): Promise<string | null> {
	for (const [label, checkpoint] of checkpoints) {
		const check = await checkAgainst(database, checkpoint);
		if (!check.extends) return `${check.where}: ${check.problem} (${label})`;
	}
	return null;
}

async function main(): Promise<number> {
	const { values } = parseArgs({ options: { checkpoint: { type: 'string' } } });
	const given = values.checkpoint ? checkpointFile(values.checkpoint) : null;
	const remembered = rememberedCheckpoint();
	const database = await openDatabase(config().databasePath);
	try {
		const report = await verifyLedger(database);
		const counted = `${report.entries} ledger entries, ${report.certificates} certificates`;
		if (!report.valid) {
			console.log(`ledger BROKEN at ${report.firstBroken}: ${report.problem} (${counted}).`);
			return 1;
		}
		const checkpoints: [string, LedgerCheckpoint][] = [];
		if (given) checkpoints.push([`the checkpoint in ${values.checkpoint}`, given]);
		if (remembered) checkpoints.push(['the last checkpoint this service published', remembered]);
		const unreached = await firstUnreached(database, checkpoints);
		if (unreached) {
			console.log(`ledger BROKEN at ${unreached}; ${counted}.`);
			return 1;
		}
		const reaches = given
			? `; it extends the checkpoint of ${given.at} (${given.entries} entries)`
			: '';
		console.log(`ledger intact: ${counted}${reaches}.`);
		return 0;
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
