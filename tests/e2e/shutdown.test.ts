/**
 * Clean shutdown (issue 7 §5, issue 10): the built app, with the demo seeded, its mail catcher
 * listening and a check running on the worker threads, ends by itself on SIGINT and on SIGTERM
 * (POSIX signals as Node delivers them) — with exit status 0, not through the last-resort exit
 * (the app's own bound, STOP_BOUND_MS in app.ts). And while checks run and an upload is in
 * flight: after SIGTERM new connections are refused, the upload is answered or cut (never a 5xx),
 * cut checks are queued again, and the next start finishes them. No duration is asserted.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import http from 'node:http';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { seedApiWorld } from './api-world';
import { addFinishedClaims } from './certificate-world';
import { assertWhole, readRows, send, whenChanged } from './fault-world';
import { startApp, type AppServer } from './server';

/** Resolves with the exit code. No deadline of its own: a hang fails by the runner's timeout. */
function exitOf(child: ReturnType<typeof spawn>): Promise<number | null> {
	return new Promise((resolve) => child.once('exit', (code) => resolve(code)));
}

describe('shutdown', () => {
	for (const signal of ['SIGINT', 'SIGTERM'] as const) {
		it(`exits cleanly on ${signal} with the demo, mail catcher and check workers running`, async () => {
			const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-shutdown-'));
			const server = await startApp({ RANKSEAL_DATA_DIR: dataDir, RANKSEAL_DEMO: '1' });
			try {
				// A long check occupies a worker thread (unless it has finished already).
				const token = readFileSync(path.join(dataDir, 'demo', 'api-token.txt'), 'utf8').trim();
				const api = (route: string, init: RequestInit = {}) =>
					fetch(`${server.origin}/api/v1${route}`, {
						...init,
						headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }
					});
				const claims = (await (await api('/claims')).json()) as { items: { id: string }[] };
				const body = JSON.stringify({ resamples: 1_000_000, seed: 3 });
				const started = await api(`/claims/${claims.items[0].id}/checks`, { method: 'POST', body });
				expect(started.status).toBe(202);
				const child = server.child;
				const exited = exitOf(child);
				child.kill(signal);
				expect(await exited).toBe(0);
				expect(server.output()).not.toMatch(/shutdown:/);
			} finally {
				await server.stop();
				rmSync(dataDir, { recursive: true, force: true });
			}
		});
	}
});

/** Resolves once the server has said it is stopping (printed after its listener closed). */
function untilSaid(server: AppServer, pattern: RegExp): Promise<void> {
	return new Promise((done) => {
		const heard = () => {
			if (!pattern.test(server.output())) return;
			server.child.stdout?.off('data', heard);
			done();
		};
		server.child.stdout?.on('data', heard);
		heard();
	});
}

/** A connection attempt: true when refused (nothing listens), false when it was accepted. */
function refused(port: number): Promise<boolean> {
	return new Promise((done) => {
		const socket = connect(port, '127.0.0.1');
		socket.once('connect', () => {
			socket.destroy();
			done(false);
		});
		socket.once('error', (error: NodeJS.ErrnoException) => done(error.code === 'ECONNREFUSED'));
	});
}

/**
 * An upload whose headers the server has taken (it answered 100 Continue) and whose body never
 * comes, as from a stalled client; resolves with the status, or 0 when the connection was cut.
 */
async function heldUpload(server: AppServer, token: string, claimId: string) {
	const csv = toCountsCsv(sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 20_000, 77), []);
	const url = `${server.origin}/api/v1/claims/${claimId}/datasets`;
	const headers = {
		authorization: `Bearer ${token}`,
		'content-type': 'text/csv',
		'content-length': Buffer.byteLength(csv),
		expect: '100-continue'
	};
	const request = http.request(url, { method: 'POST', headers, agent: false });
	const answered = new Promise<number>((done) => {
		request.on('response', (response) => {
			response.resume();
			response.on('end', () => done(response.complete ? (response.statusCode ?? 0) : 0));
			response.on('error', () => done(0));
		});
		request.on('error', () => done(0));
	});
	request.flushHeaders();
	await new Promise<void>((done) => request.once('continue', () => done()));
	return { answered };
}

describe('SIGTERM while checks run and a request is in flight', () => {
	it('refuses new connections, re-queues cut checks, exits 0; the next start finishes them', async () => {
		const world = await seedApiWorld();
		const claims = await addFinishedClaims(world.dataDir, 2);
		let server = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
		try {
			const token = world.tokens.lake;
			const checks: string[] = [];
			for (const claim of claims) {
				const body = JSON.stringify({ resamples: 1_000_000, seed: 11 });
				const answer = await send(
					`${server.origin}/api/v1/claims/${claim.claimId}/checks`,
					'POST',
					{
						authorization: `Bearer ${token}`,
						'content-type': 'application/json',
						'content-length': body.length
					},
					body
				);
				expect(answer.status, answer.body).toBe(202);
				checks.push(JSON.parse(answer.body).id);
			}
			const upload = await heldUpload(server, token, claims[0].claimId);
			const exited = exitOf(server.child);
			server.child.kill('SIGTERM');
			await untilSaid(server, /SIGTERM: stopping/);
			expect(await refused(server.port)).toBe(true);
			// The stalled upload does not hold the stop: its connection is closed when the drain
			// ends (0), or it is turned away (503) if the app reached it only after the signal.
			expect(await exited, server.output()).toBe(0);
			expect([0, 503]).toContain(await upload.answered);
			expect(server.output()).not.toMatch(/shutdown:/);
			// A clean stop leaves no check `running`: each is done or queued again.
			const rows = await readRows<{ status: string }>(
				world.dataDir,
				`SELECT status FROM checks WHERE id IN ('${checks.join("','")}')`
			);
			expect(rows.filter((r) => !['done', 'queued'].includes(r.status))).toEqual([]);
			server = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
			const finished = async () =>
				(
					await readRows(
						world.dataDir,
						`SELECT id FROM checks WHERE status != 'done' AND id IN ('${checks.join("','")}')`
					)
				).length === 0;
			await whenChanged(world.dataDir, finished);
			await server.stop();
			await assertWhole(world.dataDir);
		} finally {
			await server.stop();
			rmSync(world.dataDir, { recursive: true, force: true });
		}
	}, 300_000);
});
