/**
 * A fresh SQLite database with the real check worker bundled beside it, for tests that run checks
 * end to end; close() stops the runner and removes both folders.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { temporaryDatabase } from './db';

export async function workerDatabase(workers = 1) {
	const ctx = await temporaryDatabase();
	const workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-worker-test-'));
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.RANKSEAL_CHECK_WORKERS = String(workers);
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(
		path.join(workerFolder, 'check-worker.mjs')
	);
	return {
		...ctx,
		/** Room for other bundles and files a test writes (removed with the rest). */
		workerFolder,
		close: async () => {
			await stopCheckRunner(ctx.database);
			await ctx.close();
			rmSync(workerFolder, { recursive: true, force: true });
		}
	};
}

export type WorkerDatabase = Awaited<ReturnType<typeof workerDatabase>>;
