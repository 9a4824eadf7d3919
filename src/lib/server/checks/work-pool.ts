/**
 * The one pool of worker threads for every engine task. Checks are long: at most `checkThreads`
 * run at once (the check runner's fair scheduler picks which). Short tasks (reading an upload,
 * checking a /seal bundle, a certificate's self-check) take any thread a check does not hold, so
 * `shortThreads` threads are always theirs however many checks wait; they queue fairly by bucket
 * (a person, a client address). A freed thread goes to a waiting check first while checks hold
 * fewer than their share, else to the short task whose bucket was served longest ago. Piscina
 * never holds a queue of its own: a task is handed over only when a thread is free.
 */
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { FairScheduler } from './fair-scheduler';

/** The worker's named exports (checks/worker.ts); the check itself is its default export. */
export type ShortTaskName =
	| 'summariseCounts'
	| 'summariseTrials'
	| 'verifyBundle'
	| 'selfCheck'
	| 'canonicalCounts'
	| 'trialsEvidence'
	| 'fitTargetRun';

type RunOptions = Parameters<Piscina['run']>[1];

export class WorkPool {
	readonly threads: number;
	private readonly piscina: Piscina;
	private readonly waiting = new FairScheduler();
	private readonly starts = new Map<string, { start: () => void; refuse: (e: Error) => void }>();
	private running = 0;
	private checks = 0;
	private counter = 0;
	private closed = false;
	/** Called whenever a thread frees, before short tasks may take it (the check runner's dispatch). */
	onFree: () => void = () => {};

	constructor(
		workerFile: string,
		readonly checkThreads: number,
		readonly shortThreads = 1
	) {
		this.threads = checkThreads + shortThreads;
		this.piscina = new Piscina({
			filename: pathToFileURL(workerFile).href,
			minThreads: 0,
			maxThreads: this.threads,
			idleTimeout: 60_000
		});
	}

	/** A worker that dies outside a task (e.g. a broken bundle). */
	onError(listener: (error: Error) => void): void {
		this.piscina.on('error', listener);
	}

	/** Whether a check may take a thread now. */
	get checkSlotFree(): boolean {
		return !this.closed && this.checks < this.checkThreads && this.running < this.threads;
	}

	/** Takes a thread for a check (ask checkSlotFree first); the returned function gives it back. */
	holdCheckSlot(): () => void {
		this.checks++;
		this.running++;
		let held = true;
		return () => {
			if (!held) return;
			held = false;
			this.checks--;
			this.freed();
		};
	}

	/** Runs a check (the worker's default export) on a thread held with holdCheckSlot. */
	runCheck(task: unknown, options: RunOptions): Promise<unknown> {
		return this.piscina.run(task, options);
	}

	/** Runs a named short task once a thread is free and its bucket's turn has come. */
	runShort<T>(name: ShortTaskName, task: unknown, bucket: string): Promise<T> {
		if (this.closed) return Promise.reject(new Error('the worker pool is stopping'));
		const id = `short-${++this.counter}`;
		return new Promise<T>((done, fail) => {
			const start = () => {
				this.running++;
				(this.piscina.run(task, { name }) as Promise<T>)
					.then(done, fail)
					.finally(() => this.freed());
			};
			this.starts.set(id, { start, refuse: fail });
			this.waiting.push(bucket, id);
			this.drain();
		});
	}

	/** Short tasks waiting for a thread (tests, the bench). */
	get shortTasksWaiting(): number {
		return this.waiting.size;
	}

	private freed(): void {
		this.running--;
		this.onFree();
		this.drain();
	}

	private drain(): void {
		while (!this.closed && this.running < this.threads) {
			const id = this.waiting.next();
			if (id === undefined) return;
			const entry = this.starts.get(id)!;
			this.starts.delete(id);
			entry.start();
		}
	}

	/** Stops the threads: running tasks end with an error, waiting short tasks are refused. */
	async destroy(): Promise<void> {
		this.closed = true;
		this.waiting.clear();
		for (const { refuse } of this.starts.values()) refuse(new Error('the worker pool is stopping'));
		this.starts.clear();
		await this.piscina.destroy();
	}
}
