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
	 * Total counts in the same proportions for a 90 % chance of certifying the claim, found by
	 * simulating the engine on the data's own tables (planner/power.ts); offered only when the
	 * point value of the quantity the bound is built on (S, or the floor P_0 + P_1 − 1) clears it.
	 */
	countsNeeded?: number;
	/** The simulated probability of certifying at countsNeeded. */
	powerAtCountsNeeded?: number;
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
	/** Simulates the engine for the total counts giving 90 % power; null when too big to simulate here. */
	countsForPower?: () => SimulatedCounts | null;
}

export interface SimulatedCounts {
	totalCounts: number;
	power: number;
	experiments: number;
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
		const simulated = v.countsForPower?.() ?? null;
		const clears = `At the data, ${v.boundBasisName} clears the bound for Schmidt number ${k} but its lower confidence bound does not`;
		if (simulated) {
			const factor = simulated.totalCounts / v.totalCounts;
			verdict.countsNeeded = simulated.totalCounts;
			verdict.powerAtCountsNeeded = simulated.power;
			verdict.shortfall =
				`${clears}: about ${simulated.totalCounts.toExponential(2)} counts in all (×${factor.toFixed(2)}), in the same proportions, ` +
				`certify it in ${(100 * simulated.power).toFixed(1)} % of ${simulated.experiments} simulated checks.`;
		} else
			verdict.shortfall = `${clears}. The counts needed are too costly to simulate within one check; the planner (/plan, npm run plan) gives them.`;
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
