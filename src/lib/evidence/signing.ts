/** Ed25519 (RFC 8032) signatures over UTF-8 text, keys and signatures as lower-case hex. */
import { ed25519 } from '@noble/curves/ed25519.js';
import { bytesToHex, hexToBytes } from '@noble/hashes/utils.js';
import { sha256Hex } from './hash';

export interface SigningKey {
	/** SHA-256 of the 32 public-key bytes: the key's name in manifests and the ledger. */
	id: string;
	publicKey: string;
	secretKey: string;
}

const utf8 = (text: string) => new TextEncoder().encode(text);
const isHex = (text: string, bytes: number) => new RegExp(`^[0-9a-f]{${bytes * 2}}$`).test(text);

export const keyIdOf = (publicKeyHex: string): string => sha256Hex(hexToBytes(publicKeyHex));

export function newSigningKey(): SigningKey {
	const { secretKey, publicKey } = ed25519.keygen();
	return signingKeyFrom(bytesToHex(secretKey), bytesToHex(publicKey));
}

export function signingKeyFrom(secretKeyHex: string, publicKeyHex?: string): SigningKey {
	if (!isHex(secretKeyHex, 32)) throw new Error('a secret key is 64 lower-case hex digits');
	const publicKey = bytesToHex(ed25519.getPublicKey(hexToBytes(secretKeyHex)));
	if (publicKeyHex !== undefined && publicKeyHex !== publicKey)
		throw new Error('the public key does not belong to the secret key');
	return { id: keyIdOf(publicKey), publicKey, secretKey: secretKeyHex };
}

export function signText(text: string, secretKeyHex: string): string {
	return bytesToHex(ed25519.sign(utf8(text), hexToBytes(secretKeyHex)));
}

/** True only for a well-formed signature by this public key over exactly this text. */
export function verifyText(text: string, signatureHex: string, publicKeyHex: string): boolean {
	if (!isHex(signatureHex, 64) || !isHex(publicKeyHex, 32)) return false;
	try {
		return ed25519.verify(hexToBytes(signatureHex), utf8(text), hexToBytes(publicKeyHex), {
			zip215: false
		});
	} catch {
		return false;
	}
}

/** The one-line hex text of a signature or public key file, read strictly (a trailing newline). */
export function readHexLine(text: string, bytes: number): string | null {
	const match = /^([0-9a-f]+)\n$/.exec(text);
	return match && isHex(match[1], bytes) ? match[1] : null;
}
