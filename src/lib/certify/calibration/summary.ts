/** What a result records about the calibration it used (and what the plan checks first). */
import { InputError } from '../counts';
import type { MethodId } from '../witnesses';
import type { Calibration } from './calibration-file';
import { calibratedMu, type CalibratedMu } from './calibrated-ladder';

export interface CalibrationSummary extends CalibratedMu {
	/** SHA-256 of the calibration file's bytes, when the caller gave it. */
	sha256: string | null;
	/** ε, the stated error of every overlap. */
	tolerance: number;
	bases: number[];
}

export function calibrationSummary(
	calibration: Calibration,
	o: { method: MethodId; d: number; bases: number[]; sha256?: string }
): CalibrationSummary {
	if (o.method !== 'mub-correlation')
		throw new InputError(
			o.method === 'steering-2mub'
				? 'calibration: the steering test has no proven bound for measured overlaps (witnesses.md §4.2 addendum); a calibration is used with mub-correlation only'
				: `calibration: a calibration is used with mub-correlation only, not ${o.method}`
		);
	if (calibration.dimension !== o.d)
		throw new InputError(
			`calibration $.dimension: the calibration is for d = ${calibration.dimension}, the counts for d = ${o.d}`
		);
	return {
		...calibratedMu(calibration, o.bases),
		sha256: o.sha256 ?? null,
		tolerance: calibration.tolerance,
		bases: o.bases
	};
}
