/**
 * The certificate's second page, the evidence behind the result: the method and what it assumes,
 * the statistic, the ladder of bounds with its table, and the cautions. Blocks added later go
 * after the cautions (the page has room for a few more lines).
 */
import { witnessFamilies } from '../../certify';
import { margin, onScale, visibility } from '../../components/rounding';
import { assumptionsOf } from '../../evidence/cautions';
import type { WitnessManifest as EvidenceManifest } from '../../evidence/manifest';
import { write } from './pdf-fonts';
import { drawLadder, num, shownRungs } from './pdf-ladder';
import { field, heading, INK, paragraph } from './pdf-parts';

type Doc = PDFKit.PDFDocument;

export function methodBlock(doc: Doc, m: EvidenceManifest): void {
	heading(doc, 'Method and what it assumes');
	const family = witnessFamilies[m.result.method];
	field(doc, 'Method', `${family.title} (${m.claim.method}); ${m.result.trust}`);
	field(doc, 'Bases', `${m.claim.bases.join(', ')}; Fourier convention: ${m.claim.fourier}`);
	field(
		doc,
		'Counts',
		m.result.backgroundSubtracted ? 'background-subtracted' : 'raw, as recorded'
	);
	field(
		doc,
		'Bootstrap',
		`${m.parameters.resamples.toLocaleString('en')} resamples, seed ${m.parameters.seed}, confidence ${m.parameters.confidence}`
	);
	field(doc, 'Engine', m.engineVersion);
	field(doc, 'Reference', m.result.reference);
}

export function statisticBlock(doc: Doc, m: EvidenceManifest): void {
	const r = m.result;
	const s = r.statistic;
	heading(doc, 'The statistic');
	field(doc, 'Value', `${onScale(r, s.value)} (bootstrap standard error ${num(s.standardError)})`);
	field(doc, `One-sided lower bound at confidence ${r.confidence}`, onScale(r, s.lower));
	field(doc, 'How the bound is made', s.boundNote);
	field(doc, '95 % interval', `${onScale(r, s.interval95[0])} to ${onScale(r, s.interval95[1])}`);
	heading(doc, 'The ladder of bounds');
	const x = doc.page.margins.left;
	const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;
	drawLadder(doc, r, x, doc.y + 4, width);
	doc.x = x;
}

const COLUMNS = [0, 150, 250, 360];

function tableRow(doc: Doc, cells: string[], bold = false): void {
	const x = doc.page.margins.left;
	const y = doc.y;
	doc.fontSize(8.5).fillColor(INK);
	cells.forEach((cell, i) =>
		write(
			doc,
			cell,
			bold ? 'bold' : 'regular',
			{ width: 140, lineBreak: false },
			{ x: x + COLUMNS[i], y }
		)
	);
	doc.x = x;
	doc.y = y + 12;
}

export function boundsTable(doc: Doc, m: EvidenceManifest): void {
	heading(doc, 'Bounds and margins');
	const r = m.result;
	tableRow(
		doc,
		['rung r (Schmidt number ≤ r)', 'bound', 'margin (SE)', 'critical visibility'],
		true
	);
	for (const b of shownRungs(r))
		tableRow(doc, [
			String(b.upToSchmidtNumber),
			onScale(r, b.bound),
			margin(b.marginInStandardErrors),
			visibility(b.criticalVisibility)
		]);
}

export function cautionsBlock(doc: Doc, m: EvidenceManifest): void {
	heading(doc, 'Cautions');
	for (const line of [
		...assumptionsOf(m.result.trust, m.result.backgroundSubtracted),
		...m.result.warnings
	])
		paragraph(doc, `– ${line}`, 8.5);
}
