/**
 * Runs checks off the request thread: a piscina pool of worker threads executes the engine,
 * while this side moves the Check row through queued → running → done | failed, writes
 * progress about every 2 %, and marks the claim checked when a check is done.
 */
import { MessageChannel } from 'node:worker_threads';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import type { CertificationResult } from '$lib/certify';
import { config } from '../config';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { CheckAttributes } from '../db/models/Check';
import { audit } from '../services/audit';
import { datasetFilePath } from '../services/datasets';
import { checkWorkerFile } from './locate';
import type { SummaryOutcome, SummaryTask } from './summary';
import type { CheckMessage, CheckTask } from './task';

const PROGRESS_STEP = 0.02;

export class CheckRunner {
	private readonly pool: Piscina;
	/** Threads for reading uploads, apart from the checks' so that an upload never queues behind one. */
	private readonly readers: Piscina;
	private readonly active = new Map<string, Promise<void>>();
	private readonly aborts = new Map<string, AbortController>();
	private stopping = false;

	constructor(
		private readonly database: Database,
		workerFile: string,
		threads: number
	) {
		const options = {
			filename: pathToFileURL(workerFile).href,
			minThreads: 0,
			maxThreads: threads,
			idleTimeout: 60_000
		};
		this.pool = new Piscina(options);
		this.readers = new Piscina(options);
		// A worker that dies outside a task (e.g. a broken bundle) would leave its tasks waiting forever.
		this.pool.on('error', (error: Error) => {
			console.error('check worker:', error);
			for (const abort of this.aborts.values()) abort.abort(error);
		});
	}

	/** Queues the check unless it is queued or running here already. */
	enqueue(checkId: string): void {
		if (this.active.has(checkId)) return;
		const run = this.run(checkId)
			.catch((error) => console.error(`check ${checkId}:`, error))
			.finally(() => this.active.delete(checkId));
		this.active.set(checkId, run);
	}

	/** Re-queues checks that a previous process left queued or running. */
	async resume(): Promise<string[]> {
		const { Check } = this.database.models;
		const rows = await Check.findAll({
			where: { status: ['queued', 'running'] },
			order: [['createdAt', 'ASC']]
		});
		const ids = rows.map((r) => r.get('id') as string).filter((id) => !this.active.has(id));
		if (ids.length)
			await Check.update(
				{ status: 'queued', progress: 0, startedAt: null },
				{ where: { id: ids } }
			);
		ids.forEach((id) => this.enqueue(id));
		return ids;
	}

	/** Reads a counts file against its claim on a worker thread, off the request thread. */
	summarise(task: SummaryTask): Promise<SummaryOutcome> {
		return this.readers.run(task, { name: 'summariseCounts' }) as Promise<SummaryOutcome>;
	}

	/** Resolves when no check is queued or running here (tests, shutdown). */
	async idle(): Promise<void> {
		while (this.active.size) await Promise.allSettled([...this.active.values()]);
	}

	async close(): Promise<void> {
		await this.idle();
		await Promise.all([this.pool.destroy(), this.readers.destroy()]);
	}

	/** Stops the threads now; checks cut short are queued again and resume at the next start. */
	async abort(): Promise<void> {
		this.stopping = true;
		const cut = [...this.active.keys()];
		await Promise.all([this.pool.destroy(), this.readers.destroy()]);
		await Promise.allSettled([...this.active.values()]);
		// The rows then say what happened (a SIGKILL leaves them `running`; resume() handles that).
		if (cut.length)
			await this.database.models.Check.update(
				{ status: 'queued', progress: 0, startedAt: null },
				{ where: { id: cut, status: ['queued', 'running'] } }
			);
	}

	private async run(checkId: string): Promise<void> {
		const { Check, Claim, Dataset } = this.database.models;
		const check = (await Check.findByPk(checkId))?.get({ plain: true });
		if (!check || check.status !== 'queued' || this.stopping) return;
		const dataset = (await Dataset.findByPk(check.datasetId))!.get({ plain: true });
		const claim = (await Claim.findByPk(check.claimId))!.get({ plain: true });
		const channel = new MessageChannel();
		let startedAt: Date | null = null;
		let written = 0;
		let writes: Promise<unknown> = Promise.resolve();
		const write = (values: Partial<CheckAttributes>) => {
			const where = { id: checkId, status: ['queued', 'running'] };
			writes = writes.then(() => Check.update(values, { where })).catch((e) => console.error(e));
		};
		channel.port1.on('message', (message: CheckMessage) => {
			if (message.type === 'started') {
				startedAt = new Date();
				write({ status: 'running', startedAt, progress: 0 });
			} else if (message.fraction - written >= PROGRESS_STEP && message.fraction < 1) {
				written = message.fraction;
				write({ progress: message.fraction });
			}
		});
		const task: CheckTask = {
			datasetPath: datasetFilePath(dataset.sha256),
			sha256: dataset.sha256,
			dimension: claim.dimension,
			method: claim.method,
			bases: claim.bases,
			fourier: claim.fourier,
			resamples: check.resamples,
			confidence: check.confidence,
			seed: Number(check.seed),
			subtractAccidentals: !!check.subtractAccidentals,
			claim: claim.claimedSchmidtNumber,
			port: channel.port2
		};
		let result: CertificationResult | null = null;
		let failure: string | null = null;
		const abort = new AbortController();
		this.aborts.set(checkId, abort);
		try {
			const options = { transferList: [channel.port2], signal: abort.signal };
			result = (await this.pool.run(task, options)) as CertificationResult;
			if (result.inputSha256 !== dataset.sha256)
				throw new Error('the result does not name the dataset’s SHA-256');
		} catch (error) {
			const reason = abort.signal.aborted
				? `the check worker stopped: ${(abort.signal.reason as Error)?.message}`
				: null;
			failure = reason ?? ((error as Error).message || 'the check failed');
		} finally {
			this.aborts.delete(checkId);
		}
		channel.port1.close();
		await writes;
		if (this.stopping) return;
		await this.finish(check, { startedAt: startedAt ?? new Date(), result, failure });
	}

	private async finish(
		check: CheckAttributes,
		outcome: { startedAt: Date; result: CertificationResult | null; failure: string | null }
	): Promise<void> {
		const { Check, Claim } = this.database.models;
		const { result, failure } = outcome;
		const done = result !== null && failure === null;
		await writeTransaction(this.database, async (transaction) => {
			await Check.update(
				done
					? {
							status: 'done',
							progress: 1,
							result,
							error: null,
							startedAt: outcome.startedAt,
							finishedAt: new Date()
						}
					: {
							status: 'failed',
							error: failure,
							startedAt: outcome.startedAt,
							finishedAt: new Date()
						},
				{ where: { id: check.id }, transaction }
			);
			const claim = await Claim.findByPk(check.claimId, { transaction });
			if (done && claim?.get('state') === 'draft')
				await claim.update({ state: 'checked' }, { transaction });
			const details = done
				? {
						certifiedSchmidtNumber: result.certifiedSchmidtNumber,
						verdict: result.claim?.verdict ?? null
					}
				: { error: failure };
			await audit(
				this.database,
				{
					actorId: check.createdBy,
					groupId: (claim?.get('groupId') as string) ?? null,
					action: done ? 'check.done' : 'check.failed',
					subjectType: 'check',
					subjectId: check.id,
					details
				},
				transaction
			);
		});
	}
}

const runners = new WeakMap<Database, Promise<CheckRunner>>();

/**
 * The runner of this database, started on first use; starting it re-queues the checks a
 * previous process left behind. Call it once at start-up so that those resume promptly.
 */
export function startCheckRunner(database: Database): Promise<CheckRunner> {
	let runner = runners.get(database);
	if (!runner) {
		runner = (async () => {
			const started = new CheckRunner(database, await checkWorkerFile(), config().checkWorkers);
			await started.resume();
			return started;
		})();
		runners.set(database, runner);
		runner.catch(() => runners.delete(database));
	}
	return runner;
}

export const hasCheckRunner = (database: Database): boolean => runners.has(database);

/** Waits for running checks, then stops the worker threads. */
export async function stopCheckRunner(database: Database): Promise<void> {
	const runner = runners.get(database);
	if (!runner) return;
	runners.delete(database);
	await (await runner).close();
}

/** For shutdown: stops the worker threads without waiting for running checks (they resume later). */
export async function abortCheckRunner(database: Database): Promise<void> {
	const runner = runners.get(database);
	if (!runner) return;
	runners.delete(database);
	await (await runner).abort();
}
