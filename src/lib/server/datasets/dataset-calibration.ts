/**
 * A calibration file uploaded beside the counts (witnesses.md §4.4): checked against the claim
 * before anything is stored; every refusal names the field `calibration` and the JSON path.
 */
import { InputError } from '$lib/certify';
import { calibrationSummary, parseCalibration } from '$lib/certify/calibration';
import { sha256Hex } from '$lib/evidence/hash';
import type { ClaimAttributes } from '../db/models/Claim';
import { FieldError } from '../core/field-error';

export interface CheckedCalibration {
	calibration: Uint8Array;
	calibrationSha256: string;
}

export function checkCalibrationUpload(
	bytes: Uint8Array | null | undefined,
	claim: Pick<ClaimAttributes, 'method' | 'dimension' | 'bases'>
): CheckedCalibration | null {
	if (!bytes || bytes.byteLength === 0) return null;
	if (claim.method === 'fidelity-target')
		throw new FieldError('calibration', 'fidelity-target takes no calibration file.');
	try {
		const parsed = parseCalibration(bytes, claim.dimension);
		// The same checks the engine makes: method, every basis present and orthonormal within ε.
		calibrationSummary(parsed, { method: claim.method, d: claim.dimension, bases: claim.bases });
	} catch (error) {
		if (error instanceof InputError) throw new FieldError('calibration', error.message);
		throw error;
	}
	return { calibration: bytes, calibrationSha256: sha256Hex(bytes) };
}
