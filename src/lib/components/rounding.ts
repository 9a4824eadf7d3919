/**
 * One rounding rule for every panel, chart and table that shows a result: values on the
 * statistic's scale carry as many decimals as two significant figures of the bootstrap SE
 * deserve (3 to 8); visibilities and other fractions of 1 carry 3.
 */
import type { CertificationResult } from '$lib/certify';

export function statisticDecimals(result: Pick<CertificationResult, 'statistic'>): number {
	const se = result.statistic.standardError;
	return se > 0 ? Math.min(8, Math.max(3, 1 - Math.floor(Math.log10(se)))) : 4;
}

/** A number on the statistic's scale, rounded by the rule above. */
export const onScale = (result: Pick<CertificationResult, 'statistic'>, x: number) =>
	x.toFixed(statisticDecimals(result));

/** A visibility (0..1). */
export const visibility = (x: number) => x.toFixed(3);

/** A signed margin in standard errors, with a true minus sign. */
export const margin = (x: number | null) =>
	x === null ? '—' : `${x >= 0 ? '+' : '−'}${Math.abs(x).toFixed(1)}`;

/** The confidence as a percentage, e.g. 99.865 %. */
export const confidencePercent = (confidence: number) => `${+(confidence * 100).toFixed(3)} %`;

/** Font size in SVG units that renders at least `px` screen pixels in a chart `width` units wide. */
export function readableSize(base: number, width: number, shownWidth: number, px = 11.5): number {
	return shownWidth > 0 ? Math.max(base, (px * width) / shownWidth) : base;
}
