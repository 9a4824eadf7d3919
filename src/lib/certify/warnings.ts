/** The plain-language warnings attached to a result. */
import { primePower } from './finite-field';
import type { MethodId } from './witnesses';

export interface WarningInputs {
	method: MethodId;
	d: number;
	subtract: boolean;
	rates: boolean;
	resamples: number;
	confidence: number;
}

/** Where basis 1 is the Fourier basis of GF(p^s), not the cyclic one, and the method depends on it. */
function fieldFourierMatters(method: MethodId, d: number): boolean {
	const pp = primePower(d);
	return method === 'fidelity-two-basis' && pp !== null && pp.exponent > 1;
}

export function warningsFor(o: WarningInputs): string[] {
	const out: string[] = [];
	if (fieldFourierMatters(o.method, o.d))
		out.push(
			'In this dimension basis 1 is the Fourier basis of the finite field GF(p^s) (outcomes labelled by base-p digits), not the cyclic Fourier basis; data measured in the cyclic basis do not fit this method.'
		);
	if (o.subtract)
		out.push(
			'Background-subtracted: accidental estimates were removed before normalising and are taken as exact (their own counting noise is not propagated into the bound); the raw-count certificate is the default.'
		);
	if (o.rates)
		out.push(
			'Cells have different integration times: probabilities are normalised rates N/τ, and the test for data no quantum state could give is skipped.'
		);
	if ((o.subtract || o.rates) && o.method === 'fidelity-two-basis')
		out.push(
			'For rates or subtracted data the fidelity bound uses the floor P₀ + P₁ − 1 alone: the exact per-cell limits need raw counts.'
		);
	const tail = o.resamples * (1 - o.confidence) * (o.method === 'fidelity-two-basis' ? 0.5 : 1);
	if (tail < 10)
		out.push(
			`Only ${tail.toFixed(1)} replicates lie below the lower bound; use more resamples for a stable bound.`
		);
	return out;
}
