/**
 * A method's page, built from its witness family description object (one source per fact): what
 * it assumes, the statistic, the bound ladder for an example dimension, the sources, when to use it.
 */
import { witnessFamilies, type MethodId } from '../certify';
import type { ClaimMethod } from '../claims/target';
import { assumptionsOf } from '../evidence/cautions';

export const EXAMPLE_DIMENSIONS = [3, 5, 7, 11] as const;

export interface MethodPage {
	id: ClaimMethod;
	title: string;
	trust: string;
	trustedSides: string;
	symbol: string;
	statisticName: string;
	formula: string;
	trustNote: string;
	basesNote: string;
	reference: string;
	assumes: string[];
	preferWhen: string | null;
	ladder: { d: number; bases: number[]; maximum: number; rungs: { r: number; bound: number }[] };
}

/** The bases the method would take from a file holding every basis 0..d, for the ladder. */
function exampleBases(id: MethodId, d: number): number[] {
	const all = Array.from({ length: d + 1 }, (_, t) => t);
	return witnessFamilies[id].defaultBases(all, d);
}

export function describeMethod(id: MethodId, d: number): MethodPage {
	const f = witnessFamilies[id];
	const bases = exampleBases(id, d);
	const rungs = f.bounds(d, bases).map((bound, i) => ({ r: i + 1, bound }));
	return {
		...{ id, title: f.title, trust: f.trust, trustedSides: f.trustedSides, symbol: f.symbol },
		...{ statisticName: f.statisticName, formula: f.formula, trustNote: f.trustNote },
		...{ basesNote: f.basesNote, reference: f.reference },
		// The assumptions every certificate states, then the method's own.
		assumes: [...assumptionsOf(f.trust, false).slice(0, 2), f.trustNote, ...(f.assumes ?? [])],
		preferWhen: f.preferWhen ?? null,
		ladder: { d, bases, maximum: f.maximum(bases), rungs }
	};
}
