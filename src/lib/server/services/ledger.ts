/**
 * The ledger: an append-only hash chain of issue, supersede and withdraw events. Each entry's
 * canonical payload names the previous entry's hash and is signed with the service key.
 */
import { MAX_PAGE } from '$lib/paging';
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
	certificateId: string;
	prevHash: string;
	keyId: string;
	at: string;
	details: Record<string, string | null>;
}

export interface LedgerEntryView {
	seq: number;
	event: LedgerEvent;
	certificateId: string;
	at: string;
	prevHash: string;
	hash: string;
	keyId: string;
	signature: string;
	/** The canonical text that was hashed and signed. */
	payload: string;
}

/** Appends one event inside the caller's transaction (which serialises writers). */
export async function appendLedger(
	database: Database,
	event: { event: LedgerEvent; certificateId: string; details: LedgerPayload['details'] },
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
