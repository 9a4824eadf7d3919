/**
 * Exact binomial confidence limits for a fraction x/n (Clopper & Pearson, Biometrika 26, 404
 * (1934)) in their Beta form (Brown, Cai & DasGupta, Stat. Sci. 16, 101 (2001)): the lower
 * limit at error α is the α-quantile of Beta(x, n − x + 1), the upper the (1 − α)-quantile of
 * Beta(x + 1, n − x), computed as 1 − the α-quantile of Beta(n − x, x + 1) (the same by symmetry):
 * the cell limits spend errors near 10⁻¹⁵, where 1 − α in floating point is off by a percent.
 */
import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';

export function clopperPearsonLower(x: number, n: number, alpha: number): number {
	if (x <= 0) return 0;
	return betaQuantile(alpha, x, n - x + 1);
}

export function clopperPearsonUpper(x: number, n: number, alpha: number): number {
	if (x >= n) return 1;
	return 1 - betaQuantile(alpha, n - x, x + 1);
}
