/**
 * The ledger's chain of signing keys, checked entry by entry: the first entry's signer is the
 * first key; each key entry must be signed with the key before it, name it as previous, carry a
 * public key with the id it introduces and the new key's signature over the introduction; every
 * other entry must be signed with a key introduced before it. Ledgers written before key entries
 * existed may have entries signed with keys introduced later, until their first key entry.
 */
import { keyIdOf, verifyText } from '../../evidence/signing';
import { introductionText } from './key-introductions';
import type { LedgerPayload } from './ledger-append';

export class KeyChain {
	private readonly introduced = new Set<string>();
	private last: string | null = null;
	private sawKeyEntry = false;
	/** Keys that signed entries of the older kind before any introduction: signer → first seq. */
	private readonly early = new Map<string, number>();

	constructor(private readonly published: Map<string, string>) {}

	/** The problem with this entry's key, or null. */
	entry(p: LedgerPayload): string | null {
		if (this.last === null) {
			this.last = p.keyId;
			this.introduced.add(p.keyId);
		}
		if (p.event === 'key') return this.introduction(p);
		if (p.certificateId === null) return 'it names no certificate';
		if (this.introduced.has(p.keyId)) return null;
		if (this.sawKeyEntry) return `signed with key ${p.keyId}, which no earlier entry introduces`;
		if (!this.early.has(p.keyId)) this.early.set(p.keyId, p.seq);
		return null;
	}

	private introduction(p: LedgerPayload): string | null {
		this.sawKeyEntry = true;
		const { introduces, publicKey, previousKeyId, proof } = p.details;
		if (p.certificateId !== null) return 'a key introduction names a certificate';
		if (!introduces || !publicKey || !proof || !previousKeyId || previousKeyId !== this.last)
			return `it does not introduce a key after the previous one, ${this.last}`;
		if (p.keyId !== this.last) return `it is not signed with the previous key ${this.last}`;
		if (!/^[0-9a-f]{64}$/.test(publicKey) || keyIdOf(publicKey) !== introduces)
			return 'its public key does not have the id it introduces';
		if (this.introduced.has(introduces)) return `key ${introduces} was introduced before`;
		if (!verifyText(introductionText({ introduces, publicKey, previousKeyId }), proof, publicKey))
			return `key ${introduces} did not sign its own introduction`;
		if (this.published.get(introduces) !== publicKey)
			return `key ${introduces} is not on the service's key list with this public key`;
		this.introduced.add(introduces);
		this.last = introduces;
		this.early.delete(introduces);
		return null;
	}

	/** An older-kind entry whose key the ledger never introduced: where and why; else null. */
	finish(): { seq: number; problem: string } | null {
		for (const [keyId, seq] of this.early)
			if (!this.introduced.has(keyId))
				return { seq, problem: `signed with key ${keyId}, which the ledger never introduces` };
		return null;
	}
}
