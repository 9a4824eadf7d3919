/**
 * A check worker that paces tests without a clock: counts files are still read by the real engine
 * (summariseCounts), but a check reports 'started' (its row says running) and then waits until the
 * runner aborts it: a cancel, a stop or a kill moves it on, never a time. With `onlySeed`, only
 * checks of that seed wait and the others run for real; with `announce: false` the check never
 * reports 'started', so its row stays queued. With `held`, the named short tasks (a /seal bundle
 * check, reading an upload) wait too: each says `{ started: n }` on that BroadcastChannel and runs
 * for real once it hears `{ go: n }` (pacedTasks below is the test's end).
 */
import { BroadcastChannel } from 'node:worker_threads';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { bundleCheckWorker } from '../src/lib/server/checks/locate';

export interface WaitingWorker {
	/** The waiting worker, for RANKSEAL_CHECK_WORKER. */
	file: string;
	/** The real worker it wraps. */
	realWorker: string;
	remove(): void;
}

export async function waitingWorker(
	options: {
		onlySeed?: number;
		announce?: boolean;
		held?: {
			channel: string;
			tasks: ('verifyBundle' | 'summariseCounts' | 'selfCheck' | 'canonicalCounts')[];
		};
	} = {}
): Promise<WaitingWorker> {
	const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-waiting-worker-'));
	const realWorker = await bundleCheckWorker(path.join(folder, 'check-worker.mjs'));
	const file = path.join(folder, 'waiting-worker.mjs');
	const announce =
		options.announce === false ? '' : "task.port?.postMessage({ type: 'started' }); ";
	const held = `${announce}return new Promise(() => {});`;
	const seedTest =
		options.onlySeed === undefined
			? ''
			: `if (task.seed !== ${options.onlySeed}) return real.default(task); `;
	const heldTasks = options.held?.tasks ?? [];
	const named = (['summariseCounts', 'selfCheck', 'verifyBundle', 'canonicalCounts'] as const).map(
		(name) =>
			heldTasks.includes(name as never)
				? `export const ${name} = (task) => held(real.${name}, task);\n`
				: `export const ${name} = real.${name};\n`
	);
	// Through the namespace: a task the real worker lacks fails when asked for, not at loading.
	writeFileSync(
		file,
		"import * as real from './check-worker.mjs';\n" +
			(options.held ? heldRunner(options.held.channel) : '') +
			named.join('') +
			`export default (task) => { ${seedTest}${held} };\n`
	);
	return { file, realWorker, remove: () => rmSync(folder, { recursive: true, force: true }) };
}

/** Runs a real task once the test's `go` for it comes on the channel. */
const heldRunner = (channel: string) => `
import { BroadcastChannel, threadId } from 'node:worker_threads';
let counter = 0;
async function held(run, task) {
	const n = \`\${threadId}-\${++counter}\`;
	const channel = new BroadcastChannel(${JSON.stringify(channel)});
	await new Promise((go) => {
		channel.onmessage = (event) => event.data?.go === n && go();
		channel.postMessage({ started: n });
	});
	channel.close();
	return run(task);
}
`;

/** The test's end of a `held` channel: which tasks have started, and letting them run. */
export function pacedTasks(name: string) {
	const channel = new BroadcastChannel(name);
	const started: string[] = [];
	let released = false;
	let listeners: (() => void)[] = [];
	channel.onmessage = (event) => {
		const n = (event as unknown as { data?: { started?: string } }).data?.started;
		if (n === undefined) return;
		started.push(n);
		if (released) channel.postMessage({ go: n });
		for (const listener of listeners) listener();
	};
	return {
		started,
		/** Resolves once `count` tasks are held on worker threads. */
		whenStarted(count: number): Promise<void> {
			return new Promise((done) => {
				const heard = () => started.length >= count && done();
				listeners.push(heard);
				heard();
			});
		},
		/** Lets every held task run, and every later one at once. */
		release(): void {
			released = true;
			for (const n of started) channel.postMessage({ go: n });
		},
		close(): void {
			listeners = [];
			channel.close();
		}
	};
}
