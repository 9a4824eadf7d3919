/**
 * The command line's block runner: a check's blocks of resamples split into contiguous ranges,
 * one per thread (this one included). Every block has its own stream (engine 2.1.0), so the
 * numbers are the same for any thread count.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { BlockRunner } from '../lib/certify';
import {
	blockCount,
	drawBlocks,
	drawsOf,
	drawsPerReplicate,
	type DrawSpec,
	type Replicates
} from '../lib/certify/confidence';
import type { BlocksJob } from './blocks-worker';

/** Below this many Gamma draws a thread's start (tens of ms) costs more than it saves. */
const THREADED_DRAWS = 3e6;

/** Threads for a run: `requested` if given (0: automatic), never more than there are blocks. */
export function threadsFor(spec: DrawSpec, resamples: number, requested = 0): number {
	const blocks = blockCount(resamples);
	if (requested > 0) return Math.min(requested, blocks);
	if (drawsPerReplicate(spec) * resamples < THREADED_DRAWS) return 1;
	return Math.max(1, Math.min(availableParallelism(), blocks));
}

/** The bundled worker beside this bundle; absent when run from the sources (then one thread). */
function workerFile(): string | null {
	const file = fileURLToPath(new URL('./blocks-worker.cjs', import.meta.url));
	return existsSync(file) ? file : null;
}

function inWorker(file: string, job: BlocksJob): Promise<Replicates> {
	return new Promise((resolve, reject) => {
		const worker = new Worker(file, { workerData: job });
		worker.once('message', resolve);
		worker.once('error', reject);
		worker.once('exit', (code) => code !== 0 && reject(new Error(`worker exited with ${code}`)));
	});
}

export function threadedBlocks(requested = 0): BlockRunner {
	return async (spec, resamples, seed) => {
		const file = workerFile();
		const threads = file ? threadsFor(spec, resamples, requested) : 1;
		const blocks = blockCount(resamples);
		const edges = Array.from({ length: threads + 1 }, (_, i) => Math.round((i * blocks) / threads));
		const others = edges
			.slice(1, -1)
			.map((from, i) => inWorker(file!, { spec, resamples, seed, from, to: edges[i + 2] }));
		const mine = drawBlocks(drawsOf(spec), resamples, seed, 0, edges[1]);
		const parts = [mine, ...(await Promise.all(others))];
		const lower = new Float64Array(resamples);
		const upper = new Float64Array(resamples);
		let at = 0;
		for (const part of parts) {
			lower.set(part.lower, at);
			upper.set(part.upper, at);
			at += part.lower.length;
		}
		return { lower, upper };
	};
}
