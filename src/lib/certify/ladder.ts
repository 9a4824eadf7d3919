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
	 * Total counts needed at the same point value, offered only when the point value of the
	 * quantity the bound is built on (S, or the fidelity floor P_0 + P_1 − 1) clears the bound.
	 */
	countsNeeded?: number;
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
	totalCounts: number;
	/** z = Φ⁻¹(confidence), for the counts estimate under the normal approximation. */
	z: number;
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
	if (basis > bound && v.standardError > 0) {
		// SE falls as 1/√N, so the bound is cleared by z standard errors at N·(z·SE/(value − B))².
		const factor = ((v.z * v.standardError) / (basis - bound)) ** 2;
		verdict.countsNeeded = Math.ceil(v.totalCounts * factor);
		verdict.shortfall =
			`At the data, ${v.boundBasisName} clears the bound for Schmidt number ${k} but its lower confidence bound does not: ` +
			`about ${verdict.countsNeeded.toExponential(2)} counts in all (×${factor.toFixed(2)}) would be needed if the data kept the same proportions.`;
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
