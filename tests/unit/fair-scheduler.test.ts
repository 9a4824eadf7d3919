/**
 * The fair scheduler against the rule of round-robin service among per-source queues (J. Nagle,
 * "On Packet Switches With Infinite Storage", RFC 970, 1985; common practice in job schedulers):
 * each queue is served first in, first out, and while one queue waits no other is served twice.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FairScheduler } from '../../src/lib/server/checks/fair-scheduler';

type Op = { kind: 'push'; bucket: string } | { kind: 'next' } | { kind: 'remove'; pick: number };

const ops = fc.array(
	fc.oneof(
		fc.record({ kind: fc.constant('push' as const), bucket: fc.constantFrom('A', 'B', 'C', 'D') }),
		fc.record({ kind: fc.constant('next' as const) }),
		fc.record({ kind: fc.constant('remove' as const), pick: fc.nat(50) })
	),
	{ maxLength: 200 }
);

describe('FairScheduler', () => {
	it('gives the issue’s example its answer: A queues 5, then B queues 1; B is served right after A’s first', () => {
		const s = new FairScheduler();
		s.push('A', 'a1');
		expect(s.next()).toBe('a1');
		for (const id of ['a2', 'a3', 'a4', 'a5']) s.push('A', id);
		s.push('B', 'b1');
		expect([s.next(), s.next(), s.next()]).toEqual(['b1', 'a2', 'a3']);
	});

	it('serves a bucket never served before ahead of one served already, oldest first between equals', () => {
		const s = new FairScheduler();
		['a1', 'a2'].forEach((id) => s.push('A', id));
		s.push('B', 'b1');
		s.push('C', 'c1');
		expect([s.next(), s.next(), s.next(), s.next(), s.next()]).toEqual([
			'a1',
			'b1',
			'c1',
			'a2',
			undefined
		]);
	});

	it('keeps first-in-first-out order within a bucket and never serves one bucket twice while another waits', () => {
		fc.assert(
			fc.property(ops, (script: Op[]) => {
				const s = new FairScheduler();
				const waiting = new Map<string, string[]>();
				/** Starts of other buckets since each waiting bucket last could have been served. */
				const servedWhileWaiting = new Map<string, Map<string, number>>();
				let n = 0;
				for (const op of script) {
					if (op.kind === 'push') {
						const id = `${op.bucket}${n++}`;
						s.push(op.bucket, id);
						if (!waiting.get(op.bucket)?.length) servedWhileWaiting.set(op.bucket, new Map());
						waiting.set(op.bucket, [...(waiting.get(op.bucket) ?? []), id]);
					} else if (op.kind === 'remove') {
						const all = [...waiting.values()].flat();
						if (!all.length) continue;
						const id = all[op.pick % all.length];
						expect(s.remove(id)).toBe(true);
						const bucket = id[0];
						waiting.set(
							bucket,
							waiting.get(bucket)!.filter((x) => x !== id)
						);
					} else {
						const id = s.next();
						const nonEmpty = [...waiting].filter(([, q]) => q.length);
						if (!nonEmpty.length) {
							expect(id).toBeUndefined();
							continue;
						}
						const bucket = id![0];
						expect(id).toBe(waiting.get(bucket)![0]);
						waiting.get(bucket)!.shift();
						for (const [other, q] of nonEmpty) {
							if (other === bucket || !q.length) continue;
							const seen = servedWhileWaiting.get(other)!;
							seen.set(bucket, (seen.get(bucket) ?? 0) + 1);
							expect(seen.get(bucket)).toBeLessThanOrEqual(1);
						}
						servedWhileWaiting.set(bucket, new Map());
					}
				}
				expect(s.size).toBe([...waiting.values()].flat().length);
			}),
			{ numRuns: 500 }
		);
	});
});
