/**
 * The certificate's block on the analyses of its counts (issue 15): how many distinct analyses
 * were run up to it, whether it is the declared one, the level it is stated at, and the list.
 * Self-contained so that the rest of the PDF can change around it.
 */
import { analysesSentence, analysisLine } from '../../evidence/analyses-words';
import type { EvidenceManifest } from '../../evidence/manifest';
import { field, heading, MUTED, paragraph } from './pdf-parts';

type Doc = PDFKit.PDFDocument;

/** Rows printed before "and n more"; the manifest holds them all. */
const MAX_ROWS = 40;

export function drawAnalyses(doc: Doc, m: EvidenceManifest): void {
	if (!m.analyses) return;
	const sentence = analysesSentence(m.analyses, m.parameters.confidence);
	heading(doc, 'Analyses of these counts');
	field(doc, 'Distinct analyses up to this certificate', String(m.analyses.total));
	paragraph(doc, sentence, 9.5);
	doc.moveDown(0.2);
	m.analyses.list
		.slice(0, MAX_ROWS)
		.forEach((a, i) => paragraph(doc, analysisLine(a, i), 8, MUTED));
	const more = m.analyses.list.length - MAX_ROWS;
	if (more > 0) paragraph(doc, `… and ${more} more, listed in the signed manifest.`, 8, MUTED);
}
