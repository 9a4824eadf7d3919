/**
 * A check worker that paces tests without a clock: counts files are still read by the real engine
 * (summariseCounts), but a check reports 'started' (its row says running) and then waits until the
 * runner aborts it: a cancel, a stop or a kill moves it on, never a time. With `onlySeed`, only
 * checks of that seed wait and the others run for real; with `announce: false` the check never
 * reports 'started', so its row stays queued.
 */
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
	options: { onlySeed?: number; announce?: boolean } = {}
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
			: `if (task.seed !== ${options.onlySeed}) return runCheck(task); `;
	writeFileSync(
		file,
		"import runCheck from './check-worker.mjs';\n" +
			"export { summariseCounts } from './check-worker.mjs';\n" +
			`export default (task) => { ${seedTest}${held} };\n`
	);
	return { file, realWorker, remove: () => rmSync(folder, { recursive: true, force: true }) };
}
