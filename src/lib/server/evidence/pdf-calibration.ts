/**
 * The certificate's one line on the bases (witnesses.md §4.4), in the characters the PDF's Latin
 * font has (no Greek, no angle brackets): how far from unbiased the bases may be, or the calibration used.
 */
import type { CertificationResult } from '../../certify';
import { percent } from '../../certify/calibration';

export function calibrationLine(result: CertificationResult): string | null {
	const c = result.calibration;
	if (c)
		return `Calibrated bases: the ladder uses the measured overlaps (mu+ = ${c.muPlus.toFixed(6)}, largest bias ${percent(c.largestBias)}, stated error ${c.tolerance}).`;
	const t = result.calibrationTolerance;
	if (!t) return null;
	if (t.value === null)
		return result.method === 'steering-2mub'
			? "Side B's calibration tolerance: not computed (the steering bound needs side B's bases exactly unbiased; no proven form for measured overlaps exists)."
			: 'Calibration tolerance: none (nothing certified).';
	return `Holds for bases unbiased to within ${percent(t.value)} (every d·|<a_t|b_s>|² within 1 ± ${t.value.toPrecision(2)}).`;
}
