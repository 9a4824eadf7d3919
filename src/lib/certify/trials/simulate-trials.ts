/**
 * Simulated time-ordered trials of an isotropic state (visibility v): each trial picks a basis at
 * random, then with probability v a matching pair (a = b uniform) and otherwise a uniform pair.
 * For the benchmark and the tests; the generator is mulberry32 (a common 32-bit generator).
 */

export function mulberry32(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** CSV text `basis,outcome_a,outcome_b` of `n` trials over `bases` (uniform settings). */
export function isotropicTrialsCsv(
	d: number,
	visibility: number,
	bases: number[],
	n: number,
	seed: number
): string {
	const random = mulberry32(seed);
	const lines: string[] = ['basis,outcome_a,outcome_b'];
	const chunk: string[] = [];
	for (let i = 0; i < n; i++) {
		const basis = bases[Math.floor(random() * bases.length)];
		const a = Math.floor(random() * d);
		const b = random() < visibility ? a : Math.floor(random() * d);
		chunk.push(`${basis},${a},${b}`);
		if (chunk.length === 65536) lines.push(chunk.splice(0).join('\n'));
	}
	if (chunk.length) lines.push(chunk.join('\n'));
	return lines.join('\n') + '\n';
}
