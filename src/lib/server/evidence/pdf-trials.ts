/**
 * The certificate PDF of the time-ordered kind (issue 20): its kind and assumption in words on
 * page one, and the evidence (p_r per rung by closed testing, the betting rule, the settings'
 * randomness check, the i.i.d. certificate of the same trials summed) on page two.
 */
import { witnessFamilies } from '../../certify';
import type { TrialsResult } from '../../certify/trials';
import type { TrialsManifest } from '../../evidence/trials-evidence';
import { write } from './pdf-fonts';
import { num } from './pdf-ladder';
import { ACCENT, field, heading, INK, MUTED, paragraph } from './pdf-parts';

type Doc = PDFKit.PDFDocument;

const KIND =
	'Certificate kind: time-ordered trials, test supermartingale (valid without the i.i.d. assumption)';
/** Rungs drawn in the table: at most this many, around the certified number. */
const SHOWN = 12;

const pText = (r: { p: number; log10P: number }) =>
	r.p > 0 ? num(r.p, 3) : `10^${r.log10P.toFixed(1)}`;

/** The kind, under the title on page one. */
export function trialsKindLine(doc: Doc): void {
	paragraph(doc, KIND, 9.5, ACCENT);
}

/** The randomness check in words: its tests and level, and the reason when it failed. */
function settingsWords(r: TrialsResult): string {
	const s = r.settings;
	const p = (x: number | null) => (x === null ? 'not computed' : num(x, 3));
	const tests = `frequency test p = ${p(s.frequencyP)}, runs test p = ${p(s.runsP)}, each at level ${s.level}`;
	return s.passed ? `passed (${tests})` : `FAILED, nothing certified: ${s.message} (${tests})`;
}

const settingsLine = (r: TrialsResult) =>
	r.bases.map((b, i) => `basis ${b}: ${num(r.probabilities[i], 4)}`).join('; ');

export function trialsResultBlock(doc: Doc, m: TrialsManifest, countsFileName: string): void {
	const r = m.result;
	heading(doc, 'Result');
	doc.fontSize(13).fillColor(ACCENT);
	write(doc, `Certified Schmidt number: ${r.certifiedSchmidtNumber}`, 'bold');
	const claimed = m.claim.claimedSchmidtNumber;
	doc.fontSize(10.5).fillColor(INK);
	write(
		doc,
		`The claimed ${claimed} is ${r.certifiedSchmidtNumber >= claimed ? 'reached' : 'not reached'} (closed testing at α = ${num(r.alpha, 4)})`,
		'bold'
	);
	doc.moveDown(0.3);
	field(doc, 'Assumption', m.trials.assumption);
	field(
		doc,
		'Mode',
		r.mode === 'blocks' ? `one setting per block (${r.blocks} blocks)` : 'one setting per trial'
	);
	field(doc, 'Setting probabilities', settingsLine(r));
	field(doc, 'Settings randomness check', settingsWords(r));
	field(doc, 'Trials', `${r.trials.toLocaleString('en')} coincidences in time order`);
	const how = m.trials.gzip ? 'gzip-compressed CSV' : 'CSV';
	field(
		doc,
		'Trials file',
		`${countsFileName} (${how}, ${m.counts.uploadedBytes.toLocaleString('en')} bytes)`
	);
	field(doc, 'Trials file SHA-256', m.counts.uploadedSha256, 8.5);
}

function rungRows(doc: Doc, r: TrialsResult): void {
	const first = Math.max(0, Math.min(r.certifiedSchmidtNumber - SHOWN + 2, r.rungs.length - SHOWN));
	const x = doc.page.margins.left;
	const row = (cells: string[], bold = false) => {
		const y = doc.y;
		doc.fontSize(8.5).fillColor(INK);
		cells.forEach((cell, i) =>
			write(
				doc,
				cell,
				bold ? 'bold' : 'regular',
				{ width: 115, lineBreak: false },
				{ x: x + i * 120, y }
			)
		);
		doc.x = x;
		doc.y = y + 12;
	};
	row(['rung r (null: SN ≤ r)', 'B_r / m', 'p_r', 'rejected at α'], true);
	for (const rung of r.rungs.slice(first, first + SHOWN))
		row([String(rung.rung), num(rung.nullMean, 5), pText(rung), rung.p <= r.alpha ? 'yes' : 'no']);
}

const iidText = (r: TrialsResult) =>
	'error' in r.iid
		? `not available (${r.iid.error})`
		: `Schmidt number ≥ ${r.iid.certifiedSchmidtNumber} (assumes i.i.d. trials; for comparison only)`;

export function trialsEvidencePage(doc: Doc, m: TrialsManifest): void {
	const r = m.result;
	doc.addPage();
	doc.fontSize(13).fillColor(INK);
	write(doc, 'The evidence behind the result', 'bold');
	heading(doc, 'Method and what it assumes');
	field(doc, 'Method', `${witnessFamilies[r.method].title} (${r.method}), per-trial matching sum`);
	field(doc, 'Bases', `${r.bases.join(', ')}; Fourier convention: ${m.claim.fourier}`);
	field(
		doc,
		'Betting rule',
		`${r.betting.rule}, bets capped at ${r.betting.cap} (${r.betting.reference})`
	);
	field(
		doc,
		'p-value',
		'p_r = min(1, 1 / max_n M_n) by Ville’s inequality, valid for any stopping rule'
	);
	field(doc, 'Engine', m.engineVersion);
	heading(doc, 'p-values per rung (closed testing down the ladder)');
	rungRows(doc, r);
	if (r.next)
		paragraph(
			doc,
			r.next.unitsNeeded === null
				? `Rung ${r.next.rung}: the observed mean of Z does not exceed its null mean; more ${r.next.unit} cannot reach it.`
				: `Rung ${r.next.rung}: about ${r.next.unitsNeeded.toLocaleString('en')} ${r.next.unit} at the observed rate would reach it.`,
			8.5,
			MUTED
		);
	heading(doc, 'Comparison');
	field(doc, 'The same trials summed, i.i.d. certificate', iidText(r));
	heading(doc, 'Cautions');
	paragraph(doc, `– ${m.trials.assumption}`, 8.5);
	if (r.condition) paragraph(doc, `– Blocks: ${r.condition}.`, 8.5);
	paragraph(doc, '– If the settings were predictable to the source, no such guarantee holds.', 8.5);
}
