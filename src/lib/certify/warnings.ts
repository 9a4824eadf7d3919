/** The plain-language warnings attached to a result. */
import { primePower } from './finite-field';
import type { FourierConvention } from './bases';
import type { MethodId } from './witnesses';

export interface WarningInputs {
	method: MethodId;
	d: number;
	fourier: FourierConvention;
	subtract: boolean;
	rates: boolean;
	resamples: number;
	confidence: number;
	/** Whether the bound was read off replicates (else no resampling took place). */
	replicated: boolean;
}

/** What the result says about the convention where it is not the plain cyclic transform. */
function fourierNote(d: number, fourier: FourierConvention): string | null {
	if (fourier === 'cyclic') return null;
	return primePower(d)!.exponent === 1
		? `For prime d = ${d} the field and cyclic Fourier conventions give the same bases; the result holds for either.`
		: `fourier=field: basis 1 is the Fourier basis of the finite field GF(${d}) (outcomes labelled by base-p digits), not the cyclic one, and the fidelity method pairs cells digit-wise.`;
}

export function warningsFor(o: WarningInputs): string[] {
	const out: string[] = [];
	const note = fourierNote(o.d, o.fourier);
	if (note) out.push(note);
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
	if (o.replicated && tail < 10)
		out.push(
			`Only ${tail.toFixed(1)} replicates lie below the lower bound; use more resamples for a stable bound.`
		);
	return out;
}
