/**
 * Ledger checkpoints: the service's signed statement "the ledger had this many entries, the last
 * with this hash, at this time". Whoever keeps one can later show that the ledger was cut short
 * or rewritten: a ledger that still holds every entry it had extends the checkpoint.
 */
import { canonicalJson } from './canonical';
import { signText, verifyText, type SigningKey } from './signing';

export const CHECKPOINT_FORMAT = 'rankseal-checkpoint/1';

export interface LedgerCheckpoint {
	format: typeof CHECKPOINT_FORMAT;
	/** Entries in the ledger (the sequence number of the newest). */
	entries: number;
	/** Hash of the newest entry; 64 zeros for an empty ledger. */
	head: string;
	at: string;
	keyId: string;
	/** Ed25519 over the canonical JSON of every other field. */
	signature: string;
}

const hex = (bytes: number) => new RegExp(`^[0-9a-f]{${bytes * 2}}$`);

/** The canonical text that is signed: every field but the signature. */
export function checkpointText(c: Omit<LedgerCheckpoint, 'signature'>): string {
	const { format, entries, head, at, keyId } = c;
	return canonicalJson({ format, entries, head, at, keyId });
}

export function signCheckpoint(
	state: { entries: number; head: string; at: string },
	key: SigningKey
): LedgerCheckpoint {
	const body = { format: CHECKPOINT_FORMAT, ...state, keyId: key.id } as const;
	return { ...body, signature: signText(checkpointText(body), key.secretKey) };
}

/** The checkpoint when `value` has exactly its shape; null otherwise. */
export function asCheckpoint(value: unknown): LedgerCheckpoint | null {
	const c = value as Partial<LedgerCheckpoint> | null;
	if (!c || typeof c !== 'object' || c.format !== CHECKPOINT_FORMAT) return null;
	const fields = Object.keys(c).sort().join(',');
	if (fields !== 'at,entries,format,head,keyId,signature') return null;
	const ok =
		Number.isSafeInteger(c.entries) &&
		c.entries! >= 0 &&
		typeof c.head === 'string' &&
		hex(32).test(c.head) &&
		typeof c.at === 'string' &&
		!Number.isNaN(Date.parse(c.at)) &&
		typeof c.keyId === 'string' &&
		hex(32).test(c.keyId) &&
		typeof c.signature === 'string' &&
		hex(64).test(c.signature);
	return ok ? (c as LedgerCheckpoint) : null;
}

/** Parses a checkpoint file's text; null when it is not one. */
export function parseCheckpoint(text: string): LedgerCheckpoint | null {
	try {
		return asCheckpoint(JSON.parse(text));
	} catch {
		return null;
	}
}

export const checkpointSigned = (c: LedgerCheckpoint, publicKeyHex: string): boolean =>
	verifyText(checkpointText(c), c.signature, publicKeyHex);

/** One line for people: "N entries, head …, at …". */
export const describeCheckpoint = (c: LedgerCheckpoint): string =>
	`${c.entries} ledger entries, head ${c.head}, at ${c.at}`;
