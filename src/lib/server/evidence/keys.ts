/**
 * The service's Ed25519 keys, kept under the data folder (keys/<id>.json, owner-only) with
 * `current` naming the one that signs. Rotation adds a key; earlier keys stay listed so that
 * certificates signed with them still verify.
 */
import {
	chmodSync,
	existsSync,
	mkdirSync,
	readdirSync,
	readFileSync,
	renameSync,
	rmSync
} from 'node:fs';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { newSigningKey, signingKeyFrom, type SigningKey } from '../../evidence/signing';
import { config } from '../core/config';

interface StoredKey {
	id: string;
	algorithm: 'Ed25519';
	publicKey: string;
	secretKey: string;
	createdAt: string;
}

export interface PublishedKey {
	id: string;
	algorithm: 'Ed25519';
	/** 32 bytes as hex. */
	publicKey: string;
	createdAt: string;
	/** When the next key took over; null for the current key. */
	retiredAt: string | null;
}

export const keyFolder = () => path.join(config().dataDir, 'keys');
const keyFile = (id: string) => path.join(keyFolder(), `${id}.json`);
const currentFile = () => path.join(keyFolder(), 'current');

function writeKey(key: SigningKey): void {
	mkdirSync(keyFolder(), { recursive: true, mode: 0o700 });
	chmodSync(keyFolder(), 0o700);
	const stored: StoredKey = { ...key, algorithm: 'Ed25519', createdAt: new Date().toISOString() };
	writeFileSync(keyFile(key.id), JSON.stringify(stored, null, '\t') + '\n', {
		mode: 0o600,
		flag: 'wx'
	});
}

function readKey(id: string): StoredKey {
	const stored = JSON.parse(readFileSync(keyFile(id), 'utf8')) as StoredKey;
	// A key file whose halves do not match is refused rather than used.
	const key = signingKeyFrom(stored.secretKey, stored.publicKey);
	if (key.id !== id) throw new Error(`key file ${id}.json holds key ${key.id}`);
	return stored;
}

/** The signing key, made on first use; two processes starting at once agree on one. */
export function serviceKey(): SigningKey {
	if (!existsSync(currentFile())) {
		const key = newSigningKey();
		writeKey(key);
		try {
			writeFileSync(currentFile(), key.id + '\n', { mode: 0o600, flag: 'wx' });
		} catch (error) {
			if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
			rmSync(keyFile(key.id), { force: true });
		}
	}
	const { id, publicKey, secretKey } = readKey(readFileSync(currentFile(), 'utf8').trim());
	return { id, publicKey, secretKey };
}

/** Makes a new signing key and makes it current; returns it (without the secret half). */
export function rotateServiceKey(): PublishedKey {
	serviceKey();
	const key = newSigningKey();
	writeKey(key);
	const next = `${currentFile()}.${key.id.slice(0, 8)}.part`;
	writeFileSync(next, key.id + '\n', { mode: 0o600 });
	renameSync(next, currentFile());
	return publishedKeys().find((k) => k.id === key.id)!;
}

/** Every key the service has signed with, oldest first, for the public key list. */
export function publishedKeys(): PublishedKey[] {
	serviceKey();
	const stored = readdirSync(keyFolder())
		.filter((name) => /^[0-9a-f]{64}\.json$/.test(name))
		.map((name) => readKey(name.slice(0, -5)))
		.sort((a, b) => a.createdAt.localeCompare(b.createdAt) || a.id.localeCompare(b.id));
	const current = readFileSync(currentFile(), 'utf8').trim();
	const others = stored.filter((k) => k.id !== current);
	const ordered = [...others, stored.find((k) => k.id === current)!];
	return ordered.map((k, i) => ({
		id: k.id,
		algorithm: k.algorithm,
		publicKey: k.publicKey,
		createdAt: k.createdAt,
		retiredAt: i + 1 < ordered.length ? ordered[i + 1].createdAt : null
	}));
}

/** A key the service has signed with, secret half included (to introduce its successor). */
export function storedSigningKey(id: string): SigningKey {
	const { publicKey, secretKey } = readKey(id);
	return { id, publicKey, secretKey };
}

/** The public half of a key the service has used, or null. */
export function publicKeyById(id: string): string | null {
	return publishedKeys().find((k) => k.id === id)?.publicKey ?? null;
}
