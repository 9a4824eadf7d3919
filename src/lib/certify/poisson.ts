/**
 * The one seeded Poisson source of the engine, so that the same inputs and seed give
 * bit-identical results on any machine: stdlib's `@stdlib/random-base-poisson`, driven by
 * its default generator MT19937 (Matsumoto & Nishimura, ACM TOMACS 8, 3 (1998)) seeded with
 * `init_genrand(seed)`, drawing by Knuth's multiplication method for means below 30 and by
 * Hörmann's transformed rejection with squeeze (PTRS; Insurance Math. Econom. 12, 39 (1993))
 * above. Draws happen in a documented order (see bootstrap.ts).
 */
import poissonFactory from '@stdlib/random-base-poisson';

export type PoissonDraw = (mean: number) => number;

export const MAX_SEED = 4294967295;

export function checkSeed(seed: number): number {
	if (!Number.isInteger(seed) || seed < 1 || seed > MAX_SEED) {
		throw new RangeError(`seed must be a whole number from 1 to ${MAX_SEED}, got ${seed}`);
	}
	return seed;
}

export function poissonSource(seed: number): PoissonDraw {
	const draw = poissonFactory.factory({ seed: checkSeed(seed) });
	// A mean of zero always gives zero (stdlib returns NaN there); no random number is used.
	return (mean) => (mean > 0 ? draw(mean) : 0);
}
