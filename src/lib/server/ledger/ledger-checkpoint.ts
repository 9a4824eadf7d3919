/**
 * Signed ledger checkpoints: made for GET /api/v1/ledger/checkpoint, every evidence bundle and
 * every notice mail, and checked against the ledger as it stands (ledger:verify --checkpoint,
 * /seal, the start-up check). The newest one published is remembered (checkpoint-memory.ts).
 */
import type { Transaction } from 'sequelize';
import { checkpointSigned, signCheckpoint, type LedgerCheckpoint } from '../../evidence/checkpoint';
import type { SigningKey } from '../../evidence/signing';
import type { Database } from '../db';
import { publishedKeys, serviceKey } from '../evidence/keys';
import { rememberCheckpoint, rememberedCheckpoint } from './checkpoint-memory';
import { GENESIS_HASH } from './ledger';

export interface CheckpointCheck {
	/** True when the ledger still holds every entry the checkpoint counted, unchanged. */
	extends: boolean;
	/** e.g. `ledger entry 7`; null when it extends. */
	where: string | null;
	problem: string | null;
}

/** The checkpoint of the ledger as this transaction (or the committed state) sees it. */
export async function currentCheckpoint(
	database: Database,
	transaction?: Transaction,
	key: SigningKey = serviceKey()
): Promise<LedgerCheckpoint> {
	const last = await database.models.LedgerEntry.findOne({ order: [['seq', 'DESC']], transaction });
	const entries = (last?.get('seq') as number | undefined) ?? 0;
	const head = (last?.get('hash') as string | undefined) ?? GENESIS_HASH;
	return signCheckpoint({ entries, head, at: new Date().toISOString() }, key);
}

const broken = (where: string, problem: string): CheckpointCheck => ({
	extends: false,
	where,
	problem
});

/** Whether the ledger as it stands extends the checkpoint; names the missing or changed entry. */
export async function checkAgainst(
	database: Database,
	checkpoint: LedgerCheckpoint
): Promise<CheckpointCheck> {
	const key = publishedKeys().find((k) => k.id === checkpoint.keyId);
	if (!key || !checkpointSigned(checkpoint, key.publicKey))
		return broken('checkpoint', 'it is not signed by a key this service has published');
	const { entries, head, at } = checkpoint;
	if (entries === 0) return { extends: true, where: null, problem: null };
	const { LedgerEntry } = database.models;
	const row = await LedgerEntry.findByPk(entries);
	if (!row) {
		const last = ((await LedgerEntry.max('seq')) as number | null) ?? 0;
		const missing = last + 1 === entries ? `entry ${entries}` : `entries ${last + 1} to ${entries}`;
		return broken(
			`ledger entry ${last + 1}`,
			`missing: the ledger ends at entry ${last}, but the checkpoint of ${at} counted ${entries} (${missing} gone)`
		);
	}
	if (row.get('hash') !== head)
		return broken(
			`ledger entry ${entries}`,
			`changed: its hash is not the ${head} the checkpoint of ${at} recorded (it or an entry before it was rewritten)`
		);
	return { extends: true, where: null, problem: null };
}

/**
 * The current checkpoint, remembered as the newest published when the ledger has grown past the
 * remembered one and still extends it (a ledger cut short keeps its alarm until an admin acts).
 */
export async function publishCheckpoint(
	database: Database,
	key: SigningKey = serviceKey()
): Promise<LedgerCheckpoint> {
	const current = await currentCheckpoint(database, undefined, key);
	try {
		const last = rememberedCheckpoint();
		const grown = !last || current.entries > last.entries;
		if (grown && (!last || (await checkAgainst(database, last)).extends))
			rememberCheckpoint(current);
	} catch (error) {
		// The checkpoint stands on its own; a memory that cannot be read or written is the admin's to mend.
		console.error(`ledger checkpoint not remembered: ${(error as Error).message}`);
	}
	return current;
}
