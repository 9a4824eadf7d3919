/** Where to put rung labels on a crowded chart axis (shared by the ladder and visibility charts). */
const ROUND_STEPS = [1, 2, 5, 10, 20, 50, 100];

/** How far rung i lies from its nearer neighbour on the axis. */
export const pitch = (at: number[], i: number) =>
	Math.min(Math.abs(at[i] - (at[i - 1] ?? -Infinity)), Math.abs((at[i + 1] ?? Infinity) - at[i]));

/** Positions near `wanted` (ascending), at least `gap` apart and within [lo, hi]. */
function spread(wanted: number[], gap: number, lo: number, hi: number): number[] {
	const groups: { first: number; size: number; sum: number }[] = [];
	const fit = (first: number, size: number) => Math.min(Math.max(first, lo), hi - (size - 1) * gap);
	for (const w of wanted) {
		let group = { first: fit(w, 1), size: 1, sum: w };
		for (let prev = groups.at(-1); prev && prev.first + prev.size * gap > group.first;) {
			groups.pop();
			const size = prev.size + group.size;
			const sum = prev.sum + group.sum;
			group = { first: fit(sum / size - ((size - 1) * gap) / 2, size), size, sum };
			prev = groups.at(-1);
		}
		groups.push(group);
	}
	return groups.flatMap((g) => Array.from({ length: g.size }, (_, k) => g.first + k * gap));
}

/**
 * Which rungs of a crowded axis get a label, and where: rung i + 1 sits at `at[i]`; the rungs in
 * `always` are labelled and pushed apart if they collide, the others at round numbers where
 * they fit, so labels stay at least `gap` apart within [lo, hi].
 */
export function rungLabels(
	at: number[],
	always: number[],
	gap: number,
	lo: number,
	hi: number
): Map<number, number> {
	const kept = [...new Set(always)].filter((i) => at[i] !== undefined);
	kept.sort((a, b) => at[a] - at[b]);
	const placed = new Map<number, number>();
	spread(
		kept.map((i) => at[i]),
		gap,
		lo,
		hi
	).forEach((p, k) => placed.set(kept[k], p));

	const roundness = (r: number) => ROUND_STEPS.findLast((s) => r % s === 0) ?? 1;
	const candidates = at
		.map((_, i) => i)
		.filter((i) => {
			const step = ROUND_STEPS.find((s) => s * pitch(at, i) >= gap);
			return !placed.has(i) && step !== undefined && (i + 1) % step === 0;
		})
		.sort((a, b) => roundness(b + 1) - roundness(a + 1) || a - b);
	for (const i of candidates) {
		if ([...placed.values()].every((p) => Math.abs(p - at[i]) >= gap)) placed.set(i, at[i]);
	}
	return placed;
}
