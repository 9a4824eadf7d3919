/**
 * The ledger: an append-only hash chain of issue, supersede and withdraw events and of the
 * introductions of new signing keys. Each entry's canonical payload names the previous entry's
 * hash and is signed with a service key.
 */
import { MAX_PAGE } from '$lib/paging';
import type { Transaction } from 'sequelize';
import type { SigningKey } from '../../evidence/signing';
import type { Database } from '../db';
import type { LedgerEntryAttributes, LedgerEvent } from '../db/models/LedgerEntry';
import { introduceKeys } from './key-introductions';
import { appendEntry, type LedgerEventInput, type LedgerPayload } from './ledger-append';

export { GENESIS_HASH, LEDGER_FORMAT, type LedgerPayload } from './ledger-append';

export interface LedgerEntryView {
	seq: number;
	event: LedgerEvent;
	certificateId: string | null;
	at: string;
	prevHash: string;
	hash: string;
	keyId: string;
	signature: string;
	/** The canonical text that was hashed and signed. */
	payload: string;
}

/**
 * Appends one certificate event inside the caller's transaction; a signing key the ledger has not
 * introduced yet is introduced first, by an entry signed with the key before it.
 */
export async function appendLedger(
	database: Database,
	event: { event: LedgerEvent; certificateId: string; details: LedgerPayload['details'] },
	key: SigningKey,
	transaction: Transaction
): Promise<LedgerEntryAttributes> {
	await introduceKeys(database, transaction);
	return appendEntry(database, event satisfies LedgerEventInput, key, transaction);
}

const view = (row: LedgerEntryAttributes): LedgerEntryView => ({
	seq: row.seq,
	event: row.event,
	certificateId: row.certificateId,
	at: new Date(row.createdAt ?? 0).toISOString(),
	prevHash: row.prevHash,
	hash: row.hash,
	keyId: row.keyId,
	signature: row.signature,
	payload: row.payload
});

export const LEDGER_PAGE_SIZE = 50;

/** One page of the ledger, oldest first (public: it holds ids and hashes, nothing private). */
export async function listLedger(
	database: Database,
	page = 1,
	pageSize = LEDGER_PAGE_SIZE
): Promise<{ items: LedgerEntryView[]; total: number; page: number; pageSize: number }> {
	const size = Math.min(Math.max(1, Math.floor(pageSize)), 200);
	const current = Math.min(MAX_PAGE, Math.max(1, Math.floor(page) || 1));
	const { rows, count } = await database.models.LedgerEntry.findAndCountAll({
		order: [['seq', 'ASC']],
		limit: size,
		offset: (current - 1) * size
	});
	return {
		items: rows.map((r) => view(r.get({ plain: true }))),
		total: count,
		page: current,
		pageSize: size
	};
}

/** The ledger's withdraw event of a certificate: why and when; null while it stands. */
export async function withdrawalOf(
	database: Database,
	certificateId: string
): Promise<{ reason: string; at: string } | null> {
	const row = await database.models.LedgerEntry.findOne({
		where: { certificateId, event: 'withdraw' },
		order: [['seq', 'ASC']]
	});
	if (!row) return null;
	const payload = JSON.parse(row.get('payload') as string) as LedgerPayload;
	return { reason: payload.details.reason ?? '', at: payload.at };
}
