/**
 * DSSE envelopes (Dead Simple Signing Envelope, secure-systems-lab/dsse, protocol.md v1 and
 * envelope.md 1.0.0) signed with the service's Ed25519 key: the signature covers PAE(type, body),
 * never the bare payload, so a payload cannot be replayed under another type.
 */
import { signText, verifyText } from './signing';

export interface DsseSignature {
	keyid: string;
	sig: string;
}

export interface DsseEnvelope {
	payload: string;
	payloadType: string;
	signatures: DsseSignature[];
}

const utf8 = new TextEncoder();
const strict = new TextDecoder('utf-8', { fatal: true });

/** PAE(type, body) = "DSSEv1" SP LEN(type) SP type SP LEN(body) SP body, LEN in ASCII decimal bytes. */
export function pae(payloadType: string, body: string): string {
	const typeBytes = utf8.encode(payloadType).byteLength;
	const bodyBytes = utf8.encode(body).byteLength;
	return `DSSEv1 ${typeBytes} ${payloadType} ${bodyBytes} ${body}`;
}

const toBase64 = (bytes: Uint8Array) => Buffer.from(bytes).toString('base64');

/** Standard or URL-safe Base64 (both allowed by envelope.md), read strictly; null otherwise. */
export function fromBase64(text: string): Uint8Array | null {
	if (typeof text !== 'string' || !/^[A-Za-z0-9+/_-]*={0,2}$/.test(text)) return null;
	const standard = text.replace(/-/g, '+').replace(/_/g, '/');
	const bytes = Buffer.from(standard, 'base64');
	const again = bytes.toString('base64');
	return again.replace(/=+$/, '') === standard.replace(/=+$/, '') ? new Uint8Array(bytes) : null;
}

/** One envelope holding `body` (UTF-8 text) signed by one key. */
export function signEnvelope(
	payloadType: string,
	body: string,
	key: { id: string; secretKey: string }
): DsseEnvelope {
	const sigHex = signText(pae(payloadType, body), key.secretKey);
	return {
		payload: toBase64(utf8.encode(body)),
		payloadType,
		signatures: [{ keyid: key.id, sig: toBase64(Buffer.from(sigHex, 'hex')) }]
	};
}

export type EnvelopeReading = { body: string } | { problem: string };

/**
 * The envelope's body when one of its signatures is by this public key over PAE(type, body) and
 * the type is the one expected; otherwise what is wrong. The keyid is only a hint (protocol.md).
 */
export function openEnvelope(
	envelope: unknown,
	payloadType: string,
	publicKeyHex: string
): EnvelopeReading {
	const e = envelope as Partial<DsseEnvelope> | null;
	if (!e || typeof e !== 'object' || !Array.isArray(e.signatures))
		return { problem: 'not a DSSE envelope (payload, payloadType, signatures)' };
	if (e.payloadType !== payloadType) return { problem: `the payloadType is not ${payloadType}` };
	const bytes = fromBase64(e.payload as string);
	if (!bytes) return { problem: 'the payload is not Base64' };
	let body: string;
	try {
		body = strict.decode(bytes);
	} catch {
		return { problem: 'the payload is not UTF-8 text' };
	}
	const message = pae(payloadType, body);
	const signed = e.signatures.some((s) => {
		const sig = fromBase64(s?.sig as string);
		return sig !== null && verifyText(message, Buffer.from(sig).toString('hex'), publicKeyHex);
	});
	return signed ? { body } : { problem: 'no signature by this key over the payload (PAE)' };
}
