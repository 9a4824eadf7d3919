/**
 * Key introductions: each new signing key enters the ledger by an entry signed with the key
 * before it, carrying the new public key and the new key's own signature over the introduction
 * (so neither key can be claimed for a chain it is not in). The ledger's first entry introduces
 * the key that signed it. A key list can then be checked for continuity (ledger-keys.ts).
 */
import type { Transaction } from 'sequelize';
import { canonicalJson } from '../../evidence/canonical';
import { signText } from '../../evidence/signing';
import type { Database } from '../db';
import { publishedKeys, storedSigningKey, type PublishedKey } from '../evidence/keys';
import { appendEntry } from './ledger-append';

export const INTRODUCTION_FORMAT = 'rankseal-key-introduction/1';

export interface Introduction {
	introduces: string;
	publicKey: string;
	previousKeyId: string;
}

/** The canonical text the new key signs (its `proof`). */
export const introductionText = (d: Introduction): string =>
	canonicalJson({
		format: INTRODUCTION_FORMAT,
		introduces: d.introduces,
		publicKey: d.publicKey,
		previousKeyId: d.previousKeyId
	});

/** The key the newest introduction names, else the first entry's signer; null when empty. */
async function lastIntroduced(database: Database, transaction: Transaction) {
	const { LedgerEntry } = database.models;
	// Key entries are the ones without a certificate: found through the certificate_id index.
	const key = await LedgerEntry.findOne({
		where: { certificateId: null },
		order: [['seq', 'DESC']],
		transaction
	});
	if (key) return (JSON.parse(key.get('payload') as string) as { details: Introduction }).details;
	const first = await LedgerEntry.findByPk(1, { transaction });
	return first ? { introduces: first.get('keyId') as string } : null;
}

/**
 * Introduces, in the caller's transaction, every published key newer than the last one the
 * ledger introduced, each signed with its predecessor; returns them. Nothing on an empty ledger.
 */
export async function introduceKeys(
	database: Database,
	transaction: Transaction
): Promise<PublishedKey[]> {
	const last = await lastIntroduced(database, transaction);
	if (!last) return [];
	const keys = publishedKeys();
	let previous = last.introduces;
	const at = keys.findIndex((k) => k.id === previous);
	if (at < 0)
		throw new Error(
			`the ledger's last key ${previous} is not in keys/: it cannot introduce the next`
		);
	const introduced = keys.slice(at + 1);
	for (const next of introduced) {
		const details = { introduces: next.id, publicKey: next.publicKey, previousKeyId: previous };
		const proof = signText(introductionText(details), storedSigningKey(next.id).secretKey);
		const event = { event: 'key' as const, certificateId: null, details: { ...details, proof } };
		await appendEntry(database, event, storedSigningKey(previous), transaction);
		previous = next.id;
	}
	return introduced;
}
