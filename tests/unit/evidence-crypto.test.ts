import { describe, expect, it } from 'vitest';
import { canonicalJson, parseCanonical } from '../../src/lib/evidence/canonical';
import {
	keyIdOf,
	newSigningKey,
	readHexLine,
	signingKeyFrom,
	signText,
	verifyText
} from '../../src/lib/evidence/signing';
import { ed25519 } from '@noble/curves/ed25519.js';
import { bytesToHex, hexToBytes } from '@noble/hashes/utils.js';
import { sha256Hex } from '../../src/lib/evidence/hash';

// RFC 8032 §7.1, "Test Vectors for Ed25519", TESTS 1–3 (from memory; all three must verify
// under the independent implementation in @noble/curves too, which a mistyped digit would break).
const RFC8032 = [
	{
		name: 'TEST 1 (empty message)',
		secret: '9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60',
		public: 'd75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a',
		message: '',
		signature:
			'e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b'
	},
	{
		name: 'TEST 2 (one byte 0x72)',
		secret: '4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb',
		public: '3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c',
		message: '72',
		signature:
			'92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c387b2eaeb4302aeeb00d291612bb0c00'
	},
	{
		name: 'TEST 3 (two bytes 0xaf82)',
		secret: 'c5aa8df43f9f837bedb7442f31dcb7b166d38535076f094b85ce3a2e0b4458f7',
		public: 'fc51cd8e6218a1a38da47ed00230f0580816ed13ba3303ac5deb911548908025',
		message: 'af82',
		signature:
			'6291d657deec24024827e69c3abe01a30ce548a284743a445e3680d7db5ac3ac18ff9b538d16f290ae67f760984dc6594a7c15e9716ed28dc027beceea1ec40a'
	}
];

describe('Ed25519 against RFC 8032 §7.1', () => {
	for (const v of RFC8032) {
		it(`${v.name}: public key and signature match the RFC`, () => {
			const key = signingKeyFrom(v.secret);
			expect(key.publicKey).toBe(v.public);
			const message = hexToBytes(v.message);
			// signText signs UTF-8 text; these messages are raw bytes, so sign them as bytes here.
			expect(bytesToHex(ed25519.sign(message, hexToBytes(v.secret)))).toBe(v.signature);
			expect(ed25519.verify(hexToBytes(v.signature), message, hexToBytes(v.public))).toBe(true);
		});
	}

	it('signs and verifies text; a changed text, signature or key is refused', () => {
		// TEST 1's message is empty: the same signature must come from signing the empty text.
		expect(signText('', RFC8032[0].secret)).toBe(RFC8032[0].signature);
		expect(verifyText('', RFC8032[0].signature, RFC8032[0].public)).toBe(true);
		const key = newSigningKey();
		const signature = signText('manifest', key.secretKey);
		expect(verifyText('manifest', signature, key.publicKey)).toBe(true);
		expect(verifyText('manifesT', signature, key.publicKey)).toBe(false);
		expect(verifyText('manifest', signature, RFC8032[1].public)).toBe(false);
		const flipped = (signature[0] === '0' ? '1' : '0') + signature.slice(1);
		expect(verifyText('manifest', flipped, key.publicKey)).toBe(false);
		expect(verifyText('manifest', signature.toUpperCase(), key.publicKey)).toBe(false);
	});

	it('names a key by the SHA-256 of its 32 public bytes, and reads hex lines strictly', () => {
		expect(keyIdOf(RFC8032[0].public)).toBe(sha256Hex(hexToBytes(RFC8032[0].public)));
		expect(readHexLine(`${RFC8032[0].public}\n`, 32)).toBe(RFC8032[0].public);
		expect(readHexLine(RFC8032[0].public, 32)).toBeNull();
		expect(readHexLine(`${RFC8032[0].public}\n\n`, 32)).toBeNull();
		expect(readHexLine(`${RFC8032[0].public.slice(2)}\n`, 32)).toBeNull();
		expect(() => signingKeyFrom(RFC8032[0].secret, RFC8032[1].public)).toThrow(/does not belong/);
	});
});

describe('canonical JSON against RFC 8785', () => {
	// RFC 8785 Appendix B, number serialisation samples: IEEE 754 bit pattern → canonical text
	// (from memory).
	const numbers: [string, string][] = [
		['0000000000000000', '0'],
		['8000000000000000', '0'],
		['0000000000000001', '5e-324'],
		['8000000000000001', '-5e-324'],
		['7fefffffffffffff', '1.7976931348623157e+308'],
		['ffefffffffffffff', '-1.7976931348623157e+308'],
		['4340000000000000', '9007199254740992'],
		['c340000000000000', '-9007199254740992'],
		['4430000000000000', '295147905179352830000'],
		['44b52d02c7e14af5', '9.999999999999997e+22'],
		['44b52d02c7e14af6', '1e+23'],
		['44b52d02c7e14af7', '1.0000000000000001e+23'],
		['444b1ae4d6e2ef4e', '999999999999999700000'],
		['444b1ae4d6e2ef4f', '999999999999999900000'],
		['444b1ae4d6e2ef50', '1e+21'],
		['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
		['3eb0c6f7a0b5ed8d', '0.000001'],
		['41b3de4355555553', '333333333.3333332'],
		['41b3de4355555554', '333333333.33333325'],
		['41b3de4355555555', '333333333.3333333'],
		['41b3de4355555556', '333333333.3333334'],
		['41b3de4355555557', '333333333.33333343'],
		['becbf647612f3696', '-0.0000033333333333333333'],
		['43143ff3c1cb0959', '1424953923781206.2']
	];
	const fromBits = (hex: string) => new DataView(hexToBytes(hex).buffer).getFloat64(0);

	it.each(numbers)('number %s serialises as %s', (bits, text) => {
		expect(canonicalJson(fromBits(bits))).toBe(text);
	});

	it('refuses NaN and Infinity (RFC 8785 §3.2.2.3)', () => {
		expect(() => canonicalJson(fromBits('7fffffffffffffff'))).toThrow();
		expect(() => canonicalJson(fromBits('7ff0000000000000'))).toThrow();
	});

	it('matches the RFC 8785 §3.2.2–3.2.4 example (numbers, string escapes, literals, key order)', () => {
		// Input and output of the RFC's main example (from memory).
		const input =
			'{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],' +
			' "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/",' +
			' "literals": [null, true, false]}';
		const expected =
			'{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],' +
			'"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}';
		expect(canonicalJson(JSON.parse(input))).toBe(expected);
	});

	it('sorts keys by UTF-16 code units (RFC 8785 §3.2.3 sorting example, from memory)', () => {
		const input = JSON.parse(
			'{"\\u20ac": "Euro Sign", "\\r": "Carriage Return", "\\ufb33": "Hebrew Letter Dalet With Dagesh",' +
				' "1": "One", "\\ud83d\\ude00": "Emoji: Grinning Face", "\\u0080": "Control",' +
				' "\\u00f6": "Latin Small Letter O With Diaeresis"}'
		);
		const text = canonicalJson(input);
		const positions = [
			'Carriage Return',
			'One',
			'Control',
			'Latin Small Letter O With Diaeresis',
			'Euro Sign',
			'Emoji: Grinning Face',
			'Hebrew Letter Dalet With Dagesh'
		].map((name) => text.indexOf(name));
		expect(positions.every((p) => p >= 0)).toBe(true);
		expect([...positions].sort((a, b) => a - b)).toEqual(positions);
	});

	it('accepts only text that is already canonical', () => {
		expect(parseCanonical('{"a":1,"b":[2,3]}')).toEqual({ a: 1, b: [2, 3] });
		expect(parseCanonical('{"b":1,"a":2}')).toBeNull();
		expect(parseCanonical('{"a": 1}')).toBeNull();
		expect(parseCanonical('{"a":1.0}')).toBeNull();
		expect(parseCanonical('{"a":1')).toBeNull();
	});
});
