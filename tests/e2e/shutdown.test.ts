/**
 * Clean shutdown (issue 7 §5): the built app, with the demo seeded, its mail catcher listening
 * and a check running on the worker threads, ends by itself on SIGINT and on SIGTERM (POSIX
 * signals as Node delivers them) — with exit status 0, not through a last-resort exit.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { startApp } from './server';

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
