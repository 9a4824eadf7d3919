/**
 * One background pass at a time, woken by a queue event and by a timer (for retries); stop()
 * lets the pass in progress finish, briefly, then returns. The mail and DOI outboxes run on it.
 */
export interface BackgroundLoop {
	/** Asks for a pass soon (after the current one, if one is running). */
	wake(): void;
	/** Stops the timer and waits for the current pass, at most `graceMs`. */
	stop(graceMs: number): Promise<void>;
}

export interface LoopParts {
	/** One pass over what is due; `keepGoing()` turns false once stop() is called. */
	pass(keepGoing: () => boolean): Promise<unknown>;
	/** Subscribes `wake` to the queue's events; returns the unsubscribe. */
	subscribe(wake: () => void): () => void;
	pollMs: number;
	/** Names the loop in the error log. */
	label: string;
}

export function startBackgroundLoop(parts: LoopParts): BackgroundLoop {
	let stopping = false;
	let again = false;
	let current: Promise<void> | null = null;
	const keepGoing = () => !stopping;
	const run = async () => {
		do {
			again = false;
			await parts.pass(keepGoing).catch((error) => console.error(`${parts.label}:`, error));
		} while (again && !stopping);
	};
	const wake = () => {
		if (stopping) return;
		if (current) {
			again = true;
			return;
		}
		current = run().finally(() => (current = null));
	};
	const timer = setInterval(wake, parts.pollMs);
	timer.unref();
	const unsubscribe = parts.subscribe(() => setImmediate(wake));
	wake();
	return {
		wake,
		async stop(graceMs) {
			stopping = true;
			clearInterval(timer);
			unsubscribe();
			if (!current) return;
			// A stalled server must not hold shutdown; an interrupted row is resumed at the next start.
			let timeout: NodeJS.Timeout | undefined;
			const grace = new Promise<void>((done) => (timeout = setTimeout(done, graceMs).unref()));
			await Promise.race([current, grace]);
			clearTimeout(timeout);
		}
	};
}
