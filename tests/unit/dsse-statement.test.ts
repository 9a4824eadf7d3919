/**
 * DSSE envelopes and the in-toto Statement, against the DSSE specification
 * (secure-systems-lab/dsse, protocol.md "Version 1.0.0", section "Test Vectors", and envelope.md
 * 1.0.0) and the in-toto Attestation Framework's Statement v1 layout.
 */
import { createPublicKey, verify } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { fromBase64, openEnvelope, pae, signEnvelope } from '../../src/lib/evidence/dsse';
import { sha256Hex } from '../../src/lib/evidence/hash';
import type { EvidenceManifest } from '../../src/lib/evidence/manifest';
import { newSigningKey, signText } from '../../src/lib/evidence/signing';
import {
	signStatement,
	statementProblem,
	STATEMENT_PAYLOAD_TYPE
} from '../../src/lib/evidence/statement';

// protocol.md, "Test Vectors": payload type, body, PAE, the ECDSA P-256 key and the envelope.
const VECTOR = {
	type: 'http://example.com/HelloWorld',
	body: 'hello world',
	pae: 'DSSEv1 29 http://example.com/HelloWorld 11 hello world',
	x: 46950820868899156662930047687818585632848591499744589407958293238635476079160n,
	y: 5640078356564379163099075877009565129882514886557779369047442380624545832820n,
	payload: 'aGVsbG8gd29ybGQ=',
	sig: 'A3JqsQGtVsJ2O2xqrI5IcnXip5GToJ3F+FnZ+O88SjtR6rDAajabZKciJTfUiHqJPcIAriEGAHTVeCUjW2JIZA=='
};

const coordinate = (n: bigint) => Buffer.from(n.toString(16).padStart(64, '0'), 'hex');
const b64 = (bytes: Uint8Array | string) => Buffer.from(bytes).toString('base64');
const urlSafe = (text: string) => text.replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');

describe('PAE (DSSE protocol.md)', () => {
	it('gives the specification’s test-vector encoding', () => {
		expect(pae(VECTOR.type, VECTOR.body)).toBe(VECTOR.pae);
	});

	it('is what the specification’s own P-256 signature signs (verified by node:crypto)', () => {
		const key = createPublicKey({
			key: {
				kty: 'EC',
				crv: 'P-256',
				x: coordinate(VECTOR.x).toString('base64url'),
				y: coordinate(VECTOR.y).toString('base64url')
			},
			format: 'jwk'
		});
		const signature = Buffer.from(VECTOR.sig, 'base64');
		const ok = (message: string) =>
			verify('sha256', Buffer.from(message), { key, dsaEncoding: 'ieee-p1363' }, signature);
		expect(ok(pae(VECTOR.type, VECTOR.body))).toBe(true);
		expect(ok(VECTOR.body)).toBe(false);
		expect(Buffer.from(fromBase64(VECTOR.payload)!).toString()).toBe(VECTOR.body);
	});

	it('counts lengths in UTF-8 bytes, not characters ("byte length of s")', () => {
		expect(pae('t/é', 'ψ')).toBe('DSSEv1 4 t/é 2 ψ');
	});
});

describe('envelopes signed with Ed25519', () => {
	const key = newSigningKey();
	const envelope = signEnvelope('application/vnd.example+json', '{"a":1}', key);

	it('opens with the signer’s key, in standard or URL-safe Base64 (envelope.md: both allowed)', () => {
		expect(envelope.signatures).toEqual([{ keyid: key.id, sig: expect.any(String) }]);
		expect(openEnvelope(envelope, envelope.payloadType, key.publicKey)).toEqual({
			body: '{"a":1}'
		});
		const safe = {
			...envelope,
			payload: urlSafe(envelope.payload),
			signatures: [{ keyid: '', sig: urlSafe(envelope.signatures[0].sig) }]
		};
		expect(openEnvelope(safe, envelope.payloadType, key.publicKey)).toEqual({ body: '{"a":1}' });
	});

	it('refuses another key, another type, a changed payload and a signature over the bare body', () => {
		const other = newSigningKey();
		const refused = (e: unknown, type = envelope.payloadType) =>
			'problem' in openEnvelope(e, type, key.publicKey);
		expect('problem' in openEnvelope(envelope, envelope.payloadType, other.publicKey)).toBe(true);
		expect(refused(envelope, 'application/vnd.other+json')).toBe(true);
		expect(refused({ ...envelope, payload: b64('{"a":2}') })).toBe(true);
		const bare = b64(Buffer.from(signText('{"a":1}', key.secretKey), 'hex'));
		expect(refused({ ...envelope, signatures: [{ keyid: key.id, sig: bare }] })).toBe(true);
		const otherType = signEnvelope('x', '{"a":1}', key);
		expect(refused({ ...envelope, signatures: otherType.signatures })).toBe(true);
		expect(refused({ ...envelope, payload: '%%%' })).toBe(true);
		expect(refused(null)).toBe(true);
	});
});

describe('the in-toto Statement over a bundle', () => {
	const key = newSigningKey();
	const manifest = { format: 'rankseal-evidence/1', certificateId: 'c1' } as EvidenceManifest;
	const manifestText = canonicalJson(manifest);
	const files = {
		'manifest.json': new TextEncoder().encode(manifestText),
		'counts-uploaded.csv': new TextEncoder().encode('basis,a,b,count\n0,0,0,5\n')
	};
	const envelopeText = JSON.stringify(signStatement(files, manifest, key));

	it('carries Statement v1 with every file’s SHA-256 and the manifest as predicate', () => {
		const opened = openEnvelope(JSON.parse(envelopeText), STATEMENT_PAYLOAD_TYPE, key.publicKey);
		const statement = JSON.parse((opened as { body: string }).body);
		expect(statement._type).toBe('https://in-toto.io/Statement/v1');
		expect(statement.subject).toEqual([
			{ name: 'counts-uploaded.csv', digest: { sha256: sha256Hex(files['counts-uploaded.csv']) } },
			{ name: 'manifest.json', digest: { sha256: sha256Hex(manifestText) } }
		]);
		expect(statement.predicate).toEqual(manifest);
		expect(statementProblem(envelopeText, files, manifestText, key.publicKey)).toBeNull();
	});

	it('names a tampered or missing subject file, and refuses a predicate that is not the manifest', () => {
		const changed = { ...files, 'counts-uploaded.csv': new TextEncoder().encode('basis,a,b\n') };
		expect(statementProblem(envelopeText, changed, manifestText, key.publicKey)).toEqual({
			item: 'counts-uploaded.csv',
			message: 'its SHA-256 differs from the in-toto Statement'
		});
		const { 'counts-uploaded.csv': _gone, ...fewer } = files;
		expect(statementProblem(envelopeText, fewer, manifestText, key.publicKey)?.item).toBe(
			'counts-uploaded.csv'
		);
		const otherManifest = canonicalJson({ ...manifest, certificateId: 'c2' });
		expect(statementProblem(envelopeText, files, otherManifest, key.publicKey)?.message).toMatch(
			/predicate differs/
		);
		expect(statementProblem(envelopeText, files, manifestText, newSigningKey().publicKey)).toEqual({
			item: null,
			message: expect.stringMatching(/no signature by this key/)
		});
	});
});
