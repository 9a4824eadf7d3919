/**
 * Which waiting check starts next: one first-in-first-out queue per bucket (a group, or a review
 * link); the next start goes to the bucket served longest ago (never served: first), the oldest
 * check first within it. A bucket with one check so waits for at most one start of each other
 * bucket, never for a whole queue. Pure bookkeeping: no threads, no database, no clock.
 */
export class FairScheduler {
	private readonly queues = new Map<string, { id: string; order: number }[]>();
	private readonly bucketOf = new Map<string, string>();
	/** When each bucket last had a check started (a counter, not a time). */
	private readonly lastServed = new Map<string, number>();
	private pushes = 0;
	private starts = 0;

	get size(): number {
		return this.bucketOf.size;
	}

	has(id: string): boolean {
		return this.bucketOf.has(id);
	}

	push(bucket: string, id: string): void {
		if (this.bucketOf.has(id)) return;
		const queue = this.queues.get(bucket) ?? [];
		queue.push({ id, order: ++this.pushes });
		this.queues.set(bucket, queue);
		this.bucketOf.set(id, bucket);
	}

	/** Takes the next check to start, or undefined when none waits. */
	next(): string | undefined {
		let best: { bucket: string; served: number; order: number } | null = null;
		for (const [bucket, queue] of this.queues) {
			const served = this.lastServed.get(bucket) ?? 0;
			const order = queue[0].order;
			if (!best || served < best.served || (served === best.served && order < best.order))
				best = { bucket, served, order };
		}
		if (!best) return undefined;
		const queue = this.queues.get(best.bucket)!;
		const { id } = queue.shift()!;
		if (!queue.length) this.queues.delete(best.bucket);
		this.bucketOf.delete(id);
		this.lastServed.set(best.bucket, ++this.starts);
		return id;
	}

	/** Takes a waiting check out; false when it was not waiting. */
	remove(id: string): boolean {
		const bucket = this.bucketOf.get(id);
		if (bucket === undefined) return false;
		const queue = this.queues.get(bucket)!;
		queue.splice(
			queue.findIndex((entry) => entry.id === id),
			1
		);
		if (!queue.length) this.queues.delete(bucket);
		this.bucketOf.delete(id);
		return true;
	}

	clear(): void {
		this.queues.clear();
		this.bucketOf.clear();
	}
}
