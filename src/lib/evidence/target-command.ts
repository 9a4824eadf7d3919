/** The command line that re-runs a fidelity-target check (same engine, no resampling, no seed). */
import type { TargetResult } from '../certify/fidelity-target';

export function targetCommand(result: TargetResult, countsName: string): string {
	const claim = result.claim ? ` --claim ${result.claim.schmidtNumber}` : '';
	return (
		`npm run certify -- --counts '${countsName.replace(/'/g, `'\\''`)}' --dimension ${result.dimension}` +
		` --method fidelity-target --target ${result.target.join(',')} --confidence ${result.confidence}${claim}`
	);
}
