/**
 * Stopping on SIGTERM/SIGINT: new requests answer 503 while the server drains, then what app()
 * started is stopped; a last-resort timer ends a process that something still holds.
 */

/**
 * The whole stop fits in STOP_BOUND_MS: adapter-node lets requests in flight finish for at most
 * SHUTDOWN_TIMEOUT seconds (its default, 30, is too long), then the mail runner gets 2 s and the
 * worker threads and database close. Read by adapter-node after init, so set here.
 */
process.env.SHUTDOWN_TIMEOUT ??= '5';
const STOP_BOUND_MS = 9500;
let stopping = false;

/** True from SIGTERM/SIGINT on: hooks answer new requests 503 while the server drains. */
export const isStopping = (): boolean => stopping;

/** A last resort if some handle still holds the process: exit STOP_BOUND_MS after the signal. */
function beginStop(signal?: string): void {
	if (stopping) return;
	stopping = true;
	// Said after adapter-node's own listener has closed the listening socket (same signal).
	const said = `${signal}: stopping; no new connections, at most ${STOP_BOUND_MS} ms`;
	if (signal) setImmediate(() => console.log(said));
	setTimeout(() => {
		console.error(`shutdown: something still held the process after ${STOP_BOUND_MS} ms`);
		process.exit(1);
	}, STOP_BOUND_MS).unref();
}

async function shutDown(stop: () => Promise<void>): Promise<void> {
	beginStop();
	try {
		await stop();
	} catch (error) {
		console.error('shutdown:', error);
		process.exitCode = 1;
	}
}

/** Listens, once, for the signals that stop the server; `stop` ends what the app started. */
export function stopOnSignals(stop: () => Promise<void>): void {
	process.once('SIGTERM', beginStop);
	process.once('SIGINT', beginStop);
	// adapter-node emits this once the HTTP server has closed (SIGINT, SIGTERM).
	process.once('sveltekit:shutdown' as 'beforeExit', () => void shutDown(stop));
}
