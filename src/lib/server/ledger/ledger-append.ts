/**
 * Appending one entry to the ledger's hash chain (no key bookkeeping: ledger.ts appendLedger
 * introduces a new signing key first). Each entry's canonical payload names the previous entry's
 * hash and is signed with a service key.
 */
import type { Transaction } from 'sequelize';
import { canonicalJson } from '../../evidence/canonical';
import { sha256Hex } from '../../evidence/hash';
import { signText, type SigningKey } from '../../evidence/signing';
import type { Database } from '../db';
import type { LedgerEntryAttributes, LedgerEvent } from '../db/models/LedgerEntry';

export const LEDGER_FORMAT = 'rankseal-ledger/1';
/** The previous hash of the first entry. */
export const GENESIS_HASH = '0'.repeat(64);

export interface LedgerPayload {
	format: typeof LEDGER_FORMAT;
	seq: number;
	event: LedgerEvent;
	/** The certificate the event is about; null for a key introduction. */
	certificateId: string | null;
	prevHash: string;
	keyId: string;
	at: string;
	details: Record<string, string | null>;
}

export type LedgerEventInput = Pick<LedgerPayload, 'event' | 'certificateId' | 'details'>;

/** Appends one entry signed with `key`, inside the caller's transaction (which serialises writers). */
export async function appendEntry(
	database: Database,
	event: LedgerEventInput,
	key: SigningKey,
	transaction: Transaction
): Promise<LedgerEntryAttributes> {
	const { LedgerEntry } = database.models;
	const last = await LedgerEntry.findOne({ order: [['seq', 'DESC']], transaction });
	const at = new Date();
	const body: LedgerPayload = {
		format: LEDGER_FORMAT,
		seq: ((last?.get('seq') as number | undefined) ?? 0) + 1,
		prevHash: (last?.get('hash') as string | undefined) ?? GENESIS_HASH,
		keyId: key.id,
		at: at.toISOString(),
		...event
	};
	const payload = canonicalJson(body);
	const row = {
		seq: body.seq,
		event: body.event,
		certificateId: body.certificateId,
		payload,
		prevHash: body.prevHash,
		hash: sha256Hex(payload),
		keyId: key.id,
		signature: signText(payload, key.secretKey),
		createdAt: at
	};
	await LedgerEntry.create(row, { transaction });
	return row;
}
