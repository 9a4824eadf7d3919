/**
 * Issue 16 part 1: the pool's threads run below the request thread's priority, so heavy work on
 * a machine with few cores slows heavy work, not a bystander's request. Read back from Linux's
 * own record of the thread (/proc/thread-self/stat, field 19 "nice"; proc(5)), in a thread that
 * loads the bundled worker exactly as piscina does.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { WORKER_NICENESS } from '../../src/lib/server/checks/thread-priority';

/** The niceness a new thread reports after running `script` (an ES module body). */
function niceAfter(script: string): Promise<number> {
	const body = `${script}
const { readFileSync } = await import('node:fs');
const { parentPort } = await import('node:worker_threads');
// Fields after the command name "(…)": state is field 3, nice field 19.
parentPort.postMessage(Number(readFileSync('/proc/thread-self/stat', 'utf8').split(') ')[1].split(' ')[16]));`;
	const worker = new Worker(new URL(`data:text/javascript,${encodeURIComponent(body)}`));
	const nice = new Promise<number>((done, fail) => {
		worker.once('message', (value) => done(value as number));
		worker.once('error', fail);
	});
	return nice.finally(() => worker.terminate());
}

describe.runIf(existsSync('/proc/thread-self'))('worker thread priority', () => {
	it('a thread that loads the check worker runs at niceness 10; a plain thread does not', async () => {
		const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-priority-'));
		try {
			const file = await bundleCheckWorker(path.join(folder, 'check-worker.mjs'));
			const plain = await niceAfter('');
			const loaded = await niceAfter(`await import(${JSON.stringify(`file://${file}`)});`);
			expect(WORKER_NICENESS).toBe(10);
			// A test run already niced past 10 cannot be raised back (that needs privilege).
			expect(loaded).toBe(Math.max(plain, WORKER_NICENESS));
			if (plain < WORKER_NICENESS) expect(loaded).toBeGreaterThan(plain);
		} finally {
			rmSync(folder, { recursive: true, force: true });
		}
	});
});
