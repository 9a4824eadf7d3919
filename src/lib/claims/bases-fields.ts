/** A claim's bases: read from a form or JSON, filled in by the method, checked against d. */
import { z } from 'zod';
import { availableBases, witnessFamilies, type FourierConvention } from '$lib/certify';
import { basisProblem } from '$lib/certify/bases';
import { wholeNumber, type ValueSource } from '$lib/schema-numbers';
import { MAX_DIMENSION } from './claim-limits';
import { TARGET_METHOD, type ClaimMethod } from './target';

/** Forms: "0,1,2", "0 1" or ["0", "1"]; JSON: [0, 1] only. Empty → undefined (the default). */
export const basesField = (source: ValueSource) =>
	z.preprocess(
		(value) => {
			if (source === 'form' && typeof value === 'string')
				value = value.split(/[\s,]+/).filter((part) => part !== '');
			if (Array.isArray(value)) return value.length ? value : undefined;
			return value;
		},
		z
			.array(wholeNumber('Each basis', 0, MAX_DIMENSION, source), {
				error: 'Bases must be a list of basis numbers.'
			})
			.optional()
	);

/** An engine message as a sentence for a form: capital first letter, full stop. */
export const sentence = (reason: string) => reason.charAt(0).toUpperCase() + reason.slice(1) + '.';

/** The bases a method uses when a claim names none: 0 and 1 exist in every dimension. */
export function defaultBasesFor(method: ClaimMethod, dimension: number): number[] {
	if (method === TARGET_METHOD) return [0, 1];
	return witnessFamilies[method].defaultBases([0, 1], dimension);
}

/** Bases that do not exist in dimension d under this convention, or that the method cannot use. */
export function basesProblem(
	method: ClaimMethod,
	bases: number[],
	d: number,
	fourier: FourierConvention,
	ctx: z.RefinementCtx
): void {
	const available = availableBases(d, fourier);
	const missing = bases.filter((b) => !available.includes(b));
	if (missing.length) {
		const reason = basisProblem(d, missing[0], fourier) ?? '';
		ctx.addIssue({
			code: 'custom',
			path: ['bases'],
			message: `${sentence(reason)} Available with fourier=${fourier}: ${available.join(', ')}.`
		});
		return;
	}
	try {
		if (method === TARGET_METHOD) {
			if (bases.join() !== '0,1')
				throw new RangeError('fidelity-target uses bases 0,1 (computational, then tilted)');
		} else witnessFamilies[method].checkBases(bases, d, fourier);
	} catch (error) {
		ctx.addIssue({ code: 'custom', path: ['bases'], message: sentence((error as Error).message) });
	}
}
