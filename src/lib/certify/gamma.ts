/**
 * The seeded Gamma source of the confidence bounds (reproducibility contract, DEVELOPERS.md):
 * - generator: the same seeded xoroshiro128+ as poisson.ts (seededGenerator); a uniform is (one 32-bit output + ½) × 2⁻³², so it is never 0 or 1 (logs stay finite);
 * - normal variates: Box–Muller, cosine branch only (two uniforms per normal, no cached pair);
 * - Gamma(a, 1) for whole a from 1 to 4 (engine 2.1.0): −ln(U₁⋯U_a), the Erlang variate as a sum of
 *   a exponentials (exact; Devroye, Non-Uniform Random Variate Generation (1986), §IX.3, from
 *   memory), a uniforms and one logarithm instead of Marsaglia–Tsang's three uniforms, a logarithm, a
 *   root and a cosine; the per-cell draws of sparse tables are mostly such shapes;
 * - Gamma(a, 1) for other a ≥ 1: Marsaglia & Tsang, ACM Trans. Math. Softw. 26, 363 (2000), with
 *   their squeeze; every shape here is a whole number of counts, and Gamma(0) is the point mass at 0.
 * Hand-written because no installed package draws a Gamma variate from this generator.
 */
import { blockGenerator, seededGenerator } from './poisson';

/** Largest whole shape drawn as a product of uniforms (4 uniforms cost about one normal). */
const ERLANG_MAX_SHAPE = 4;

type Generator = ReturnType<typeof seededGenerator>;

const TWO_TO_MINUS_32 = 2.3283064365386963e-10;
const TWO_PI = 6.283185307179586;

export class GammaSampler {
	private readonly rng: Generator;

	/** The seed's own stream, or with `block` the stream of that block of resamples. */
	constructor(seed: number, block?: number) {
		this.rng = block === undefined ? seededGenerator(seed) : blockGenerator(seed, block);
	}

	/** A uniform in (0, 1), never exactly 0 or 1. */
	uniform(): number {
		return ((this.rng.next() >>> 0) + 0.5) * TWO_TO_MINUS_32;
	}

	/** A standard normal variate by Box–Muller (cosine branch). */
	normal(): number {
		const u = this.uniform();
		const v = this.uniform();
		return Math.sqrt(-2 * Math.log(u)) * Math.cos(TWO_PI * v);
	}

	/** Gamma(shape, 1) for shape 0 (gives 0) or shape ≥ 1. */
	gamma(shape: number): number {
		if (shape <= 0) return 0;
		if (shape < 1) throw new RangeError(`gamma shape must be 0 or at least 1, got ${shape}`);
		if (shape <= ERLANG_MAX_SHAPE && Number.isInteger(shape)) {
			let product = this.uniform();
			for (let k = 1; k < shape; k++) product *= this.uniform();
			return -Math.log(product);
		}
		const d = shape - 1 / 3;
		const c = 1 / Math.sqrt(9 * d);
		for (;;) {
			let x: number;
			let v: number;
			do {
				x = this.normal();
				v = 1 + c * x;
			} while (v <= 0);
			v = v * v * v;
			const u = this.uniform();
			const x2 = x * x;
			if (u < 1 - 0.0331 * x2 * x2) return d * v;
			if (Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) return d * v;
		}
	}

	/** Beta(a, b) as G_a/(G_a + G_b), drawn in that order; a = 0 gives 0 and b = 0 gives 1. */
	beta(a: number, b: number): number {
		const ga = this.gamma(a);
		const gb = this.gamma(b);
		if (a <= 0) return 0;
		if (b <= 0) return 1;
		return ga / (ga + gb);
	}
}
