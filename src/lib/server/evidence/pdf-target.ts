/**
 * A fidelity-target certificate's own lines (witnesses.md §4.3′): the target it holds for and the
 * assumption that λ was fixed before the data, then its evidence page (exact limits, the ladder
 * Σλ², the cautions). The witness families' page is pdf-evidence.ts.
 */
import { visibility } from '../../components/rounding';
import { assumptionsOf } from '../../evidence/cautions';
import type { TargetManifest } from '../../evidence/manifest';
import { num } from './pdf-ladder';
import { field, heading, paragraph } from './pdf-parts';

type Doc = PDFKit.PDFDocument;

const coefficients = (xs: number[]) => `(${xs.map((x) => x.toFixed(6)).join(', ')})`;

/** Where λ came from, in the words the certificate states as its assumption. */
export function targetAssumption(m: TargetManifest): string {
	const lambda = `The target λ = ${coefficients(m.target.coefficients)}`;
	const run = m.target.source === 'calibration-run' ? m.target.run : undefined;
	const where = run
		? `${lambda} was fitted on a separate calibration run (${run.file} in the bundle, SHA-256 ${run.sha256}) and frozen before the first check; `
		: `${lambda} was declared with the claim before the data were seen; `;
	return (
		where +
		'the certified number holds for this target only, and only if it was not chosen by looking at these counts.'
	);
}

/** The short answer the evidence page gives. */
const targetSourceWords = (m: TargetManifest) =>
	m.target.source === 'calibration-run'
		? 'fitted on a separate calibration run (each λ_m² its share of the run’s matching pairs), frozen before the first check; the verifier re-fits it'
		: 'declared with the claim, before the data';

/** Page one: the target and its assumption, under the certified number. */
export function targetLines(doc: Doc, m: TargetManifest): void {
	paragraph(doc, targetAssumption(m), 9.5);
}

/** Page two of a fidelity-target certificate. */
export function targetEvidence(doc: Doc, m: TargetManifest): void {
	const r = m.result;
	const s = r.statistic;
	heading(doc, 'Method and what it assumes');
	field(
		doc,
		'Method',
		'Fidelity with a declared target Σ λ_m |mm⟩ (fidelity-target); device-dependent'
	);
	field(
		doc,
		'Tables',
		'basis 0 the computational table; basis 1 the table in the tilted vectors, same integration time'
	);
	field(doc, 'Target λ (Σλ² = 1)', coefficients(m.target.coefficients));
	if (m.target.declared) field(doc, 'Target as declared', coefficients(m.target.declared));
	field(doc, 'Where λ came from', targetSourceWords(m));
	field(doc, 'Bound', `exact limits, no resampling; confidence ${m.parameters.confidence}`);
	field(doc, 'Engine', m.engineVersion);
	field(doc, 'Reference', 'Bavaresco et al., Nat. Phys. 14, 1032 (2018); witnesses.md §4.3′');
	heading(doc, 'The statistic');
	field(doc, 'Value F̃', num(s.value, 6));
	field(doc, `One-sided lower bound at confidence ${r.confidence}`, num(s.lower, 6));
	field(doc, 'How the bound is made', s.boundNote);
	field(doc, '95 % interval', `${num(s.interval95[0], 6)} to ${num(s.interval95[1], 6)}`);
	heading(doc, 'Bounds: F ≤ Σ_{i≤r} λ_i² for Schmidt number ≤ r');
	for (const b of r.bounds.slice(0, 12))
		field(
			doc,
			`r = ${b.upToSchmidtNumber}`,
			`${num(b.bound, 6)} (critical visibility ${visibility(b.criticalVisibility)})`,
			8.5
		);
	heading(doc, 'Cautions');
	for (const line of [
		targetAssumption(m),
		...assumptionsOf('device-dependent', false),
		...r.warnings
	])
		paragraph(doc, `– ${line}`, 8.5);
}
