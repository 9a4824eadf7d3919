/** Fidelity with a declared non-maximally entangled target (witnesses.md §4.3′). */
export { targetBounds, targetCoefficients, targetFidelity, whiteNoiseValue } from './statistic';
export { targetLowerBound, targetPointValue, targetUpperBound, type TargetData } from './bound';
export { certifyTarget, type TargetOptions, type TargetResult } from './certify-target';
export { isTargetResult } from './result';
export { certifyDeclaredTarget, TARGET_CAUTION, type DeclaredTarget } from './declared';
export { fitTarget, requireSeparateRun, type TargetFit } from './fit';
export { certifyClaimTarget, certifyFittedTarget, fitCaution, fitSeparateRun } from './fitted';
export type { ClaimTarget } from './fitted';
