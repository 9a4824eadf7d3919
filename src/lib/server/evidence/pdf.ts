/**
 * The certificate PDF (pdfkit, A4, Noto Serif with Noto Sans Math for the symbols it lacks).
 * Page one is what a reader checks first: who claims what, the result, the counts and the
 * signature. Page two is the evidence behind it (pdf-evidence.ts).
 */
import PDFDocument from 'pdfkit';
import { visibility } from '../../components/rounding';
import { dateTimeInWords } from '../../dates';
import { orcidUrl } from '../../orcid-id';
import type { EvidenceManifest } from '../../evidence/manifest';
import type { CertificationResult } from '../../certify';
import { isTargetManifest, type WitnessManifest } from '../../evidence/manifest';
import { drawAnalyses } from './pdf-analyses';
import { attachEvidence, PDFA_OPTIONS } from './pdf-attachments';
import { calibrationLine } from './pdf-calibration';
import { boundsTable, cautionsBlock, methodBlock, statisticBlock } from './pdf-evidence';
import { registerFaces, write } from './pdf-fonts';
import { num } from './pdf-ladder';
import { isTrialsManifest } from '../../evidence/trials-evidence';
import { trialsEvidencePage, trialsKindLine, trialsResultBlock } from './pdf-trials';
import { ACCENT, drawQr, field, heading, INK, MUTED, numberPages, paragraph } from './pdf-parts';
import { targetEvidence, targetLines } from './pdf-target';

type Doc = PDFKit.PDFDocument;

/** What the certificate shows beside the signed manifest: who and what the counts came from. */
export interface CertificateContext {
	group: string;
	authors: string[];
	sourceDescription: string;
	countsFileName: string;
	coincidencesPerBasis: { basis: number; total: number }[];
	/** Authors with an ORCID iD linked at issue (sign in with ORCID); shown under the authors. */
	orcids?: { name: string; orcid: string }[];
}

export interface PdfInput {
	manifest: EvidenceManifest;
	fingerprint: string;
	signature: string;
	verifyUrl: string;
	/** The certificate's DOI name (issue 21), when it has one. */
	doi?: string;
	context: CertificateContext;
	/** The signing key's public half (hex), attached inside the PDF beside the manifest. */
	publicKey?: string;
}

/** Long free text is cut so that page one stays one page (the full text is on the claim page). */
const SOURCE_LIMIT = 420;
const AUTHORS_SHOWN = 12;
const clip = (text: string, limit: number) =>
	text.length > limit ? `${text.slice(0, limit).trimEnd()}…` : text;

function authorsText(authors: string[]): string {
	if (authors.length <= AUTHORS_SHOWN) return authors.join(', ');
	return `${authors.slice(0, AUTHORS_SHOWN).join(', ')} and ${authors.length - AUTHORS_SHOWN} more`;
}

function identity(doc: Doc, { manifest, fingerprint, verifyUrl, doi }: PdfInput) {
	const top = doc.y;
	const qrX = doc.page.width - doc.page.margins.right - 90;
	doc.fontSize(18).fillColor(INK);
	write(doc, 'Schmidt-number certificate', 'bold', { width: 380 });
	paragraph(doc, 'issued by Rankseal from the raw coincidence counts', 9, MUTED);
	if (isTrialsManifest(manifest)) trialsKindLine(doc);
	doc.moveDown(0.5);
	field(doc, 'Certificate', manifest.certificateId);
	field(doc, 'Issued', dateTimeInWords(manifest.issuedAt));
	if (doi) field(doc, 'DOI', doi);
	if (manifest.supersedes) field(doc, 'Supersedes', manifest.supersedes);
	drawQr(doc, verifyUrl, qrX, top, 90);
	doc.font('serif').fontSize(7).fillColor(MUTED);
	doc.text('Verify', qrX, top + 92, { width: 90, align: 'center' });
	doc.x = doc.page.margins.left;
	doc.y = Math.max(doc.y, top + 104);
	field(doc, 'Fingerprint (SHA-256 of the manifest)', fingerprint, 8.5);
}

function claimBlock(doc: Doc, m: EvidenceManifest, context: CertificateContext) {
	heading(doc, 'The claim');
	field(doc, 'Title', m.claim.title);
	field(doc, 'Group', context.group);
	field(doc, 'Authors', authorsText(context.authors));
	if (context.orcids?.length)
		field(doc, 'ORCID iDs', context.orcids.map((a) => `${a.name} ${orcidUrl(a.orcid)}`).join('; '));
	field(doc, 'Source', clip(context.sourceDescription, SOURCE_LIMIT));
	field(
		doc,
		'Claimed',
		`Schmidt number ${m.claim.claimedSchmidtNumber} in local dimension d = ${m.claim.dimension}`
	);
	field(doc, 'Manuscript', m.claim.manuscriptReference ?? 'none given');
}

function resultBlock(doc: Doc, m: EvidenceManifest, context: CertificateContext) {
	if (isTrialsManifest(m)) return trialsResultBlock(doc, m, context.countsFileName);
	heading(doc, 'Result');
	const r = m.result;
	doc.fontSize(13).fillColor(ACCENT);
	write(doc, `Certified Schmidt number: ${r.certifiedSchmidtNumber}`, 'bold');
	if (isTargetManifest(m)) targetLines(doc, m);
	else {
		const bases = calibrationLine(m.result as CertificationResult);
		if (bases) paragraph(doc, bases, 9.5);
	}
	const claim = r.claim;
	doc.fontSize(10.5).fillColor(INK);
	write(
		doc,
		claim
			? `Verdict on the claimed ${claim.schmidtNumber}: ${claim.verdict}`
			: 'No claim was judged',
		'bold'
	);
	if (claim && 'shortfall' in claim && claim.shortfall) paragraph(doc, claim.shortfall, 9);
	doc.moveDown(0.3);
	field(
		doc,
		'Statistic',
		`${num(r.statistic.value, 6)}, lower bound ${num(r.statistic.lower, 6)} at confidence ${r.confidence}`
	);
	field(doc, 'Effective visibility', `${visibility(r.effectiveVisibility)} (white-noise model)`);
	const perBasis = context.coincidencesPerBasis
		.map((b) => `basis ${b.basis}: ${b.total.toLocaleString('en')}`)
		.join('; ');
	field(doc, 'Coincidences', `${r.totalCounts.toLocaleString('en')} in all (${perBasis})`);
	field(
		doc,
		'Counts file',
		`${context.countsFileName} (${m.counts.uploadedFormat}, ${m.counts.uploadedBytes.toLocaleString('en')} bytes)`
	);
	field(doc, 'Counts file SHA-256', m.counts.uploadedSha256, 8.5);
}

function signatureBlock(doc: Doc, input: PdfInput) {
	heading(doc, 'Signature');
	field(doc, 'Algorithm', 'Ed25519 over the canonical manifest (RFC 8785)');
	field(
		doc,
		'Signing key fingerprint (SHA-256 of its public key)',
		input.manifest.signingKeyId,
		8.5
	);
	field(doc, 'Signature', input.signature, 8);
	field(doc, 'Verify at', input.verifyUrl);
	paragraph(
		doc,
		'Offline: unzip the evidence bundle and run `node verify.mjs` in its folder.',
		8.5,
		MUTED
	);
}

function evidencePage(doc: Doc, m: EvidenceManifest) {
	if (isTrialsManifest(m)) return trialsEvidencePage(doc, m);
	doc.addPage();
	doc.fontSize(13).fillColor(INK);
	write(doc, 'The evidence behind the result', 'bold');
	if (isTargetManifest(m)) return targetEvidence(doc, m);
	const w = m as WitnessManifest;
	methodBlock(doc, w);
	statisticBlock(doc, w);
	boundsTable(doc, w);
	cautionsBlock(doc, w);
}

/** Renders the certificate and resolves with the PDF bytes. */
export function certificatePdf(input: PdfInput): Promise<Buffer> {
	const doc = new PDFDocument({
		size: 'A4',
		margin: 50,
		bufferPages: true,
		...PDFA_OPTIONS,
		info: {
			Title: `Rankseal certificate ${input.manifest.certificateId}`,
			Author: 'Rankseal',
			CreationDate: new Date(input.manifest.issuedAt)
		}
	});
	registerFaces(doc);
	const chunks: Buffer[] = [];
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('data', (chunk: Buffer) => chunks.push(chunk));
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});
	identity(doc, input);
	claimBlock(doc, input.manifest, input.context);
	resultBlock(doc, input.manifest, input.context);
	signatureBlock(doc, input);
	evidencePage(doc, input.manifest);
	drawAnalyses(doc, input.manifest);
	numberPages(doc, `Certificate ${input.manifest.certificateId}`);
	attachEvidence(doc, input);
	doc.end();
	return done;
}
