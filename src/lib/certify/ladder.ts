/** The ladder of bounds and the certified Schmidt number (witnesses.md §5). */

/** 1 + #{r : x > B_r}: strict, so equality with a bound certifies nothing. */
export function ladderPosition(x: number, bounds: number[]): number {
	return 1 + bounds.filter((b) => x > b).length;
}

/** Violation of each bound in bootstrap standard errors; null when the error is zero. */
export function marginsInStandardErrors(
	value: number,
	bounds: number[],
	standardError: number
): (number | null)[] {
	return bounds.map((b) => (standardError > 0 ? (value - b) / standardError : null));
}

export interface ClaimVerdict {
	schmidtNumber: number;
	verdict: 'supported' | 'not supported';
	/** For an unsupported claim: the rung r = k − 1 whose bound the lower confidence bound must exceed. */
	boundToBeat?: number;
	/** The witness's white-noise threshold visibility for that rung (at the point value). */
	visibilityNeeded?: number;
	/**
	 * For an unsupported claim: whether the point value of the quantity the bound is built on (S,
	 * or the floor P_0 + P_1 − 1) clears the rung, so that more counts would certify it. How many is
	 * simulated after the check (planner/check-counts.ts), never inside what issuing re-runs.
	 */
	moreCountsHelp?: boolean;
	/** One sentence on what it would take. */
	shortfall?: string;
}

export interface VerdictInputs {
	claim: number;
	certified: number;
	value: number;
	/** Point value of the quantity the lower bound is built on (S itself, or the fidelity floor). */
	boundBasisValue: number;
	/** Its standard error (SD of its lower replicates). */
	standardError: number;
	/** What the bound is built on, in words ('the statistic' or 'the floor P₀ + P₁ − 1'). */
	boundBasisName: string;
	bounds: number[];
	criticalVisibilities: number[];
	effectiveVisibility: number;
}

export function claimVerdict(v: VerdictInputs): ClaimVerdict {
	const k = v.claim;
	if (v.certified >= k) return { schmidtNumber: k, verdict: 'supported' };
	const bound = v.bounds[k - 2];
	const visibilityNeeded = v.criticalVisibilities[k - 2];
	const verdict: ClaimVerdict = {
		schmidtNumber: k,
		verdict: 'not supported',
		boundToBeat: bound,
		visibilityNeeded
	};
	const basis = v.boundBasisValue;
	verdict.moreCountsHelp = basis > bound && v.standardError > 0;
	if (verdict.moreCountsHelp) {
		verdict.shortfall =
			`At the data, ${v.boundBasisName} clears the bound for Schmidt number ${k} but its lower confidence bound does not: ` +
			`more counts in the same proportions would certify it. How many is simulated once the check is done (the check page, ` +
			`npm run certify) and by the planner (/plan, npm run plan).`;
	} else {
		const what =
			v.value > bound
				? `The point value clears the bound for Schmidt number ${k}, but ${v.boundBasisName}, on which the confidence bound is built, does not, so more counts cannot be shown to help.`
				: `The point value does not clear the bound for Schmidt number ${k}; more counts cannot help.`;
		verdict.shortfall =
			`${what} The witness's white-noise threshold visibility for this rung is ${visibilityNeeded.toFixed(4)}; ` +
			`under a white-noise model the data show ${v.effectiveVisibility.toFixed(4)}.`;
	}
	return verdict;
}
