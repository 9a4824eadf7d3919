import { fidelityTwoBasis } from './fidelity-two-basis';
import { mubCorrelation } from './mub-correlation';
import { steering2Mub } from './steering-2mub';
import type { MethodId, WitnessFamily } from './types';

export type { MethodId, Trust, WitnessFamily } from './types';

export const witnessFamilies: Record<MethodId, WitnessFamily> = {
	'mub-correlation': mubCorrelation,
	'steering-2mub': steering2Mub,
	'fidelity-two-basis': fidelityTwoBasis
};

export const METHOD_IDS = Object.keys(witnessFamilies) as MethodId[];

export function isMethodId(value: string): value is MethodId {
	return Object.hasOwn(witnessFamilies, value);
}
