/** The bundle README's paragraph on a fidelity-target certificate's calibration run. */
import type { EvidenceManifest } from '../../evidence/manifest';

/** fidelity-target with λ from a run: what the run file is and what verify.mjs does with it. */
export const targetRunNote = (m: EvidenceManifest) =>
	m.target?.run
		? `\n${m.target.run.file}: the separate calibration run the target λ was fitted on (each λ_m² its share of the run's matching pairs), as uploaded. verify.mjs re-fits λ from it, checks that it equals the certified λ and that the run is not the certified counts, then re-runs the check.\n`
		: '';
