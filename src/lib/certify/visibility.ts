/**
 * White-noise visibility (witnesses.md §7). Under ρ_η = η Φ_d + (1 − η) 𝟙/d² every witness
 * statistic here is affine in η, so η_eff = (value − s_0)/(s_1 − s_0) and the critical
 * visibility of rung r is η*_r = (B_r − s_0)/(s_1 − s_0), with s_1, s_0 the statistic on Φ_d
 * and on 𝟙/d². For an m-basis matching sum this is §7's (S/m − 1/d)/(1 − 1/d).
 */
import type { WitnessFamily } from './witnesses';

function idealTables(d: number, count: number, pure: boolean): Float64Array[] {
	return Array.from({ length: count }, () => {
		const p = new Float64Array(d * d);
		if (pure) for (let a = 0; a < d; a++) p[a * d + a] = 1 / d;
		else p.fill(1 / (d * d));
		return p;
	});
}

export interface NoiseScale {
	pure: number;
	white: number;
}

/** The statistic on Φ_d (every MUB gives p(a, b) = δ_ab/d) and on the maximally mixed state. */
export function noiseScale(family: WitnessFamily, d: number, bases: number[]): NoiseScale {
	return {
		pure: family.statistic(idealTables(d, bases.length, true), d, bases),
		white: family.statistic(idealTables(d, bases.length, false), d, bases)
	};
}

export function visibilityOf(statistic: number, scale: NoiseScale): number {
	return (statistic - scale.white) / (scale.pure - scale.white);
}
