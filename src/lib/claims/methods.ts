/** What pages say about a claim's method, for the witness families and the declared-target check. */
import { witnessFamilies } from '$lib/certify';
import { TARGET_METHOD, type ClaimMethod } from './target';

/** The facts every page names a method by (a witness family has these and more). */
export interface MethodFacts {
	title: string;
	trustedSides: string;
	symbol: string;
	reference: string;
}

/** fidelity-target (witnesses.md §4.3′): one source for its name on every page. */
export const TARGET_FACTS = {
	id: TARGET_METHOD,
	title: 'Fidelity with a declared target',
	trust: 'device-dependent',
	trustedSides: 'both sides trusted',
	symbol: 'F̃',
	reference: 'Bavaresco et al., Nat. Phys. 14, 1032 (2018) (§4.3′, re-derived)',
	statisticName: 'lower bound on the fidelity with the declared target Φ_λ = Σ_m λ_m |mm⟩',
	formula: 'F̃ ≤ F(ρ, Φ_λ) from the computational table and the tilted matches; F ≤ Σ_{i≤r} λ_i².',
	basesNote: 'bases 0 (computational) and 1 (tilted vectors ṽ_j of the declared λ)'
} as const;

export function methodFacts(method: ClaimMethod): MethodFacts {
	return method === TARGET_METHOD ? TARGET_FACTS : witnessFamilies[method];
}
