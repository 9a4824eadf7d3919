/**
 * The embedded CheckQueue: the fair scheduler hands checks to the work pool (work-pool.ts) only
 * when a check thread is free, while this side moves the Check row through queued → running →
 * done | failed (or cancelled, by checks service), writes progress about every 2 %, and marks
 * the claim checked when a check is done.
 */
import { MessageChannel } from 'node:worker_threads';
import { literal } from 'sequelize';
import type { CertificationResult } from '$lib/certify';
import type { CountsAdvice } from '$lib/certify/planner/check-counts';
import type { Database } from '../db';
import { ACTIVE_CHECK_STATUSES, type CheckModel } from '../db/models/Check';
import { FairScheduler } from './fair-scheduler';
import { recordOutcome } from './outcome';
import { sweepLeftChecks } from './left-behind';
import { CheckCancelled, type CheckQueue, type QueuedCheck } from './queue';
import { checkTaskOf } from './check-input';
import { engineTasksOn, type EngineTasks } from './engine-tasks';
import type { CheckMessage } from './task';
import type { AdvisedResult } from './worker';
import { WorkPool } from './work-pool';

export type { CheckQueue, QueuedCheck } from './queue';

const PROGRESS_STEP = 0.02;

/** Values of a conditional update of the row (a column may be an SQL expression). */
type CheckUpdate = Parameters<CheckModel['update']>[0];

export class CheckRunner implements CheckQueue {
	/** The one pool for every engine task: checks here, short tasks through `tasks`. */
	private readonly work: WorkPool;
	private readonly waiting = new FairScheduler();
	private readonly active = new Map<string, Promise<void>>();
	private readonly aborts = new Map<string, AbortController>();
	/** Ids in the order they were handed to a thread (tests read the fairness from it). */
	readonly started: string[] = [];
	private stopping = false;
	/** The short engine tasks, on the same threads (engine-tasks.ts). */
	readonly tasks: EngineTasks;

	constructor(
		private readonly database: Database,
		workerFile: string,
		threads: number,
		shortThreads = 1
	) {
		this.work = new WorkPool(workerFile, threads, shortThreads);
		this.tasks = engineTasksOn(this.work);
		this.work.onFree = () => this.dispatch();
		// A worker that dies outside a task (e.g. a broken bundle) would leave its tasks waiting forever.
		this.work.onError((error: Error) => {
			console.error('check worker:', error);
			for (const abort of this.aborts.values()) abort.abort(error);
		});
	}

	enqueue({ id, bucket }: QueuedCheck): void {
		if (this.active.has(id) || this.stopping) return;
		this.waiting.push(bucket, id);
		this.dispatch();
	}

	/** Starts waiting checks while a check thread is free: the pool itself never holds a queue. */
	private dispatch(): void {
		while (!this.stopping && this.work.checkSlotFree) {
			const id = this.waiting.next();
			if (id === undefined) return;
			this.started.push(id);
			const abort = new AbortController();
			this.aborts.set(id, abort);
			const release = this.work.holdCheckSlot();
			const run = this.run(id, abort)
				.catch((error) => console.error(`check ${id}:`, error))
				.finally(() => {
					this.aborts.delete(id);
					this.active.delete(id);
					release();
				});
			this.active.set(id, run);
		}
	}

	cancel(checkId: string): boolean {
		if (this.waiting.remove(checkId)) return true;
		const abort = this.aborts.get(checkId);
		abort?.abort(new CheckCancelled());
		return abort !== undefined;
	}

	async resume(): Promise<string[]> {
		const held = (id: string) => this.active.has(id) || this.waiting.has(id);
		const again = await sweepLeftChecks(this.database, held);
		for (const check of again) this.enqueue(check);
		return again.map((c) => c.id);
	}

	/** Resolves once this check's run has ended here and the next waiting one was handed on. */
	async settled(checkId: string): Promise<void> {
		await this.active.get(checkId);
	}

	async idle(): Promise<void> {
		while (this.active.size) await Promise.allSettled([...this.active.values()]);
	}

	async close(): Promise<void> {
		await this.idle();
		await this.work.destroy();
	}

	/** Stops the threads now; checks cut short are queued again and resume at the next start. */
	async abort(): Promise<void> {
		this.stopping = true;
		// Waiting checks stay `queued` in the database and resume at the next start.
		this.waiting.clear();
		const cut = [...this.active.keys()];
		await this.work.destroy();
		await Promise.allSettled([...this.active.values()]);
		// The rows then say what happened (a SIGKILL leaves them `running`; resume() handles that).
		// A clean stop is not the check's fault: it gives back the start that counts towards the limit.
		if (cut.length)
			await this.database.models.Check.update(
				{
					status: 'queued',
					progress: 0,
					startedAt: null,
					attempts: literal('max(attempts - 1, 0)')
				},
				{ where: { id: cut, status: 'running' } }
			);
	}

	private async run(checkId: string, abort: AbortController): Promise<void> {
		const { Check } = this.database.models;
		const check = (await Check.findByPk(checkId))?.get({ plain: true });
		if (!check || check.status !== 'queued' || this.stopping) return;
		const channel = new MessageChannel();
		let startedAt: Date | null = null;
		let written = 0;
		let writes: Promise<unknown> = Promise.resolve();
		const write = (values: CheckUpdate) => {
			const where = { id: checkId, status: ACTIVE_CHECK_STATUSES };
			writes = writes.then(() => Check.update(values, { where })).catch((e) => console.error(e));
		};
		channel.port1.on('message', (message: CheckMessage) => {
			if (message.type === 'started') {
				startedAt = new Date();
				// Counted with the very write that marks it running: a kill after it counts as a cut.
				write({ status: 'running', startedAt, progress: 0, attempts: literal('attempts + 1') });
			} else if (message.fraction - written >= PROGRESS_STEP && message.fraction < 1) {
				written = message.fraction;
				write({ progress: message.fraction });
			}
		});
		let result: CertificationResult | null = null;
		let countsAdvice: CountsAdvice | null = null;
		let failure: string | null = null;
		try {
			const task = await checkTaskOf(this.database, check, channel.port2);
			const options = { transferList: [channel.port2], signal: abort.signal };
			// A trials result (kind 'time-ordered-trials') is kept in the same column; see isTrialsResult.
			const { countsAdvice: advice, ...answer } = (await this.work.runCheck(
				task,
				options
			)) as AdvisedResult;
			[result, countsAdvice] = [answer, advice ?? null];
			if (result.inputSha256 !== task.sha256)
				throw new Error('the result does not name the dataset’s SHA-256');
		} catch (error) {
			const reason = abort.signal.aborted
				? `the check worker stopped: ${(abort.signal.reason as Error)?.message}`
				: null;
			failure = reason ?? ((error as Error).message || 'the check failed');
		}
		channel.port1.close();
		await writes;
		// A cancelled check's row was written by whoever cancelled it.
		if (this.stopping || abort.signal.reason instanceof CheckCancelled) return;
		await recordOutcome(this.database, check, {
			startedAt: startedAt ?? new Date(),
			result,
			countsAdvice,
			failure
		});
	}
}
