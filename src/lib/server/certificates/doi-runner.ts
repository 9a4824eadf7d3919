/**
 * The app's DOI registration: the local fake registry when no DATACITE_URL is set, and a background
 * sender that runs registerDue when DOI work is queued and on a timer (for retries), one pass at a
 * time; stop() lets the request in flight finish, briefly, then returns.
 */
import path from 'node:path';
import { startBackgroundLoop } from '../core/background-loop';
import { config } from '../core/config';
import type { Database } from '../db';
import { dataciteClient } from './datacite-client';
import { setDoiResolver } from './doi-name';
import { onDoiQueued } from './doi-outbox';
import { registerDue, resumeInterruptedDois } from './doi-sender';
import { startFakeRegistry, type FakeRegistry } from './fake-registry';

export interface DoiRunner {
	/** The local fake registry, running only when no DATACITE_URL is configured. */
	fakeRegistry: FakeRegistry | null;
	wake(): void;
	stop(graceMs?: number): Promise<void>;
}

const POLL_MS = 15_000;

async function registry() {
	const { datacite, dataDir } = config();
	if (datacite.url) return { account: datacite, fake: null };
	const file = path.join(dataDir, 'fake-doi-registry.json');
	const fake = await startFakeRegistry({ ...datacite, port: datacite.fakePort, file });
	// DOIs of the fake resolve through the fake, so the links on pages work in the demo.
	setDoiResolver(`${fake.url}/`);
	return { account: { ...datacite, url: fake.url }, fake };
}

export async function startDoiRunner(database: Database): Promise<DoiRunner> {
	await resumeInterruptedDois(database);
	const { account, fake } = await registry();
	const client = dataciteClient(account);
	const loop = startBackgroundLoop({
		pass: (keepGoing) => registerDue(database, client, new Date(), keepGoing),
		subscribe: onDoiQueued,
		pollMs: POLL_MS,
		label: 'DOI sender'
	});
	return {
		fakeRegistry: fake,
		wake: loop.wake,
		async stop(graceMs = 2000) {
			await loop.stop(graceMs);
			setDoiResolver(null);
			await fake?.close();
		}
	};
}
