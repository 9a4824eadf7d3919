/**
 * The critical visibility of one rung against the dimension (witnesses.md §7): for the steering
 * test it falls as d grows — high dimensions tolerate more noise.
 */
import { availableBases, MAX_DIMENSION } from '../bases';
import { noiseScale, visibilityOf } from '../visibility';
import { witnessFamilies, type MethodId } from '../witnesses';

export interface CurvePoint {
	dimension: number;
	criticalVisibility: number;
}

/** Probability cells the noise scale may build for one point (d² per basis). */
const CELLS_PER_POINT = 4_000_000;

/** Dimensions from k: every one up to k + 8, then roughly doubling up to the maximum. */
export function curveDimensions(k: number): number[] {
	const out = new Set<number>();
	for (let d = Math.max(2, k); d <= Math.min(MAX_DIMENSION, k + 8); d++) out.add(d);
	for (let d = 16; d <= MAX_DIMENSION; d *= 2) if (d >= k) out.add(d);
	out.add(MAX_DIMENSION);
	return [...out].sort((a, b) => a - b);
}

/** η* to certify Schmidt number k for each dimension where the basis set exists (and fits). */
export function visibilityCurve(
	method: MethodId,
	k: number,
	bases: number[] | 'all'
): CurvePoint[] {
	const family = witnessFamilies[method];
	const out: CurvePoint[] = [];
	for (const d of curveDimensions(k)) {
		const chosen = bases === 'all' ? availableBases(d) : bases;
		if (d * d * chosen.length > CELLS_PER_POINT) continue;
		try {
			family.checkBases(chosen, d);
		} catch {
			continue;
		}
		const bound = family.bounds(d, chosen)[k - 2];
		out.push({
			dimension: d,
			criticalVisibility: visibilityOf(bound, noiseScale(family, d, chosen))
		});
	}
	return out;
}
