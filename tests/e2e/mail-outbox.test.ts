/**
 * The built app with SMTP_URL pointing at a real SMTP server (smtp-server) that takes a message
 * and then says nothing until the test lets it: a sign-up answers anyway, the admin outbox shows
 * the message being sent, and once the server accepts it the outbox says delivered.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { seedFlowWorld, type FlowWorld } from './flow-world';
import { startApp, type AppServer } from './server';

// Safety limits on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 120_000, hookTimeout: 120_000 });

let world: FlowWorld;
let app: AppServer;
let smtp: SMTPServer;
let received: Promise<void>;
let release: () => void = () => undefined;
let accepted = 0;

beforeAll(async () => {
	let heard: () => void;
	received = new Promise((done) => (heard = done));
	smtp = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		onData(stream, _session, callback) {
			stream.resume();
			stream.on('end', () => {
				release = () => {
					accepted += 1;
					callback();
				};
				heard();
			});
		}
	});
	await new Promise<void>((done) => smtp.listen(0, '127.0.0.1', done));
	const port = (smtp.server.address() as AddressInfo).port;
	world = await seedFlowWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, SMTP_URL: `smtp://127.0.0.1:${port}` });
});
afterAll(async () => {
	release();
	await app?.stop();
	await new Promise<void>((done) => smtp.close(() => done()));
});

const asAdmin = (path: string) =>
	fetch(`${app.origin}${path}`, { headers: { cookie: `rankseal_session=${world.adminSession}` } });

/** Waits for the outbox page to show a state (states, not durations; the deadline is a safety net). */
async function outboxShows(address: string, status: string): Promise<boolean> {
	const deadline = Date.now() + 60_000;
	while (Date.now() < deadline) {
		const html = await (await asAdmin('/admin/outbox')).text();
		const row = html.split('<li').find((r) => r.includes(address));
		if (row?.includes(`data-status="${status}"`)) return true;
		await new Promise((wait) => setTimeout(wait, 200));
	}
	return false;
}

describe('a mail server that takes a message and stalls', () => {
	const email = 'stall.test@example.test';

	it('does not hold the sign-up: the page answers while the server still holds the mail', async () => {
		const response = await fetch(`${app.origin}/signup?/signup`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				accept: 'text/html',
				origin: app.origin,
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ name: 'Sam Stall', email, password: 'a long enough passphrase' })
		});
		expect(response.status, app.output()).toBe(303);
		// Only the test lets the server accept, so nothing was accepted when the answer came.
		expect(accepted).toBe(0);
		await received;
		expect(accepted).toBe(0);
		const html = await (await asAdmin('/admin/outbox')).text();
		const row = html.split('<li').find((r) => r.includes(email));
		expect(row, 'the message is listed').toBeTruthy();
		expect(row).toContain('data-status="sending"');
	});

	it('shows the message delivered once the server accepts it', async () => {
		release();
		expect(await outboxShows(email, 'sent')).toBe(true);
		expect(accepted).toBe(1);
	});
});
