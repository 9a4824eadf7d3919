/** SHA-256 (FIPS 180-4) of raw bytes, as lower-case hex. */
import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex } from '@noble/hashes/utils.js';

export function sha256Hex(bytes: Uint8Array | string): string {
	return bytesToHex(sha256(typeof bytes === 'string' ? new TextEncoder().encode(bytes) : bytes));
}
