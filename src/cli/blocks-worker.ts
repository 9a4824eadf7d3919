/**
 * Worker thread of the command line (build/cli/blocks-worker.mjs): draws blocks [from, to) of a
 * check's replicates and hands the two arrays back without copying.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { drawBlocks, drawsOf, type DrawSpec } from '../lib/certify/confidence';

export interface BlocksJob {
	spec: DrawSpec;
	resamples: number;
	seed: number;
	from: number;
	to: number;
}

const job = workerData as BlocksJob;
const replicates = drawBlocks(drawsOf(job.spec), job.resamples, job.seed, job.from, job.to);
parentPort!.postMessage(replicates, [
	replicates.lower.buffer as ArrayBuffer,
	replicates.upper.buffer as ArrayBuffer
]);
