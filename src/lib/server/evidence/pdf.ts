/**
 * The certificate PDF (pdfkit, A4, Noto Serif embedded): identity, claim, method and its
 * assumptions, the statistic, the ladder of bounds, the table of margins, the certified Schmidt
 * number and verdict, cautions, the signature and a QR code to the verification page.
 */
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import { witnessFamilies } from '../../certify';
import { assumptionsOf } from '../../evidence/cautions';
import type { EvidenceManifest } from '../../evidence/manifest';
import { drawAnalyses } from './pdf-analyses';
import { drawLadder } from './pdf-ladder';
import { ACCENT, drawQr, field, heading, INK, MUTED, numberPages } from './pdf-parts';
import { calibrationLine } from './pdf-calibration';

type Doc = PDFKit.PDFDocument;

export interface PdfInput {
	manifest: EvidenceManifest;
	fingerprint: string;
	signature: string;
	verifyUrl: string;
}

function fontFile(weight: 400 | 700): string {
	const name = `@fontsource/noto-serif/files/noto-serif-latin-${weight}-normal.woff`;
	try {
		return createRequire(import.meta.url).resolve(name);
	} catch {
		const local = path.resolve('node_modules', name);
		if (existsSync(local)) return local;
		throw new Error(`the certificate font is missing: ${name}`);
	}
}

const num = (v: number, digits = 4) =>
	Number.isFinite(v) ? Number(v.toPrecision(digits)).toString() : 'n/a';

function identity(doc: Doc, { manifest, fingerprint, verifyUrl }: PdfInput) {
	const top = doc.y;
	doc
		.font('serif-bold')
		.fontSize(18)
		.fillColor(INK)
		.text('Schmidt-number certificate', { width: 380 });
	doc
		.font('serif')
		.fontSize(9)
		.fillColor(MUTED)
		.text('issued by Rankseal from the raw coincidence counts', { width: 380 });
	doc.moveDown(0.6);
	field(doc, 'Certificate', manifest.certificateId);
	field(doc, 'Issued', manifest.issuedAt);
	doc.font('serif').fontSize(9.5).fillColor(MUTED).text('Fingerprint (SHA-256 of the manifest):');
	doc.font('serif').fontSize(8.5).fillColor(INK).text(fingerprint);
	drawQr(doc, verifyUrl, doc.page.width - doc.page.margins.right - 96, top, 96);
	doc
		.font('serif')
		.fontSize(7)
		.fillColor(MUTED)
		.text('Verify', doc.page.width - doc.page.margins.right - 96, top + 98, {
			width: 96,
			align: 'center'
		});
	doc.x = doc.page.margins.left;
	doc.y = Math.max(doc.y, top + 112);
}

function claimAndMethod(doc: Doc, m: EvidenceManifest) {
	heading(doc, 'The claim');
	field(doc, 'Title', m.claim.title);
	field(doc, 'Claimed Schmidt number', String(m.claim.claimedSchmidtNumber));
	field(doc, 'Local dimension', String(m.claim.dimension));
	field(doc, 'Manuscript', m.claim.manuscriptReference ?? 'none given');
	heading(doc, 'Method and what it assumes');
	const family = witnessFamilies[m.claim.method];
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
		`${m.parameters.resamples} resamples, seed ${m.parameters.seed}, confidence ${m.parameters.confidence}`
	);
	field(doc, 'Counts file SHA-256', m.counts.uploadedSha256);
	field(doc, 'Engine', m.engineVersion);
	field(doc, 'Reference', m.result.reference);
}

function statisticAndLadder(doc: Doc, m: EvidenceManifest) {
	const s = m.result.statistic;
	heading(doc, 'The statistic');
	field(doc, 'Value', `${num(s.value, 6)} (bootstrap standard error ${num(s.standardError)})`);
	field(doc, `One-sided lower bound at confidence ${m.result.confidence}`, num(s.lower, 6));
	field(doc, 'How the bound is made', s.boundNote);
	field(doc, '95 % interval', `${num(s.interval95[0], 6)} to ${num(s.interval95[1], 6)}`);
	heading(doc, 'The ladder of bounds');
	const x = doc.page.margins.left;
	const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;
	drawLadder(doc, m.result, x, doc.y + 4, width);
	doc.x = x;
}

function boundsTable(doc: Doc, m: EvidenceManifest) {
	heading(doc, 'Bounds and margins');
	const x = doc.page.margins.left;
	const columns = [0, 90, 200, 330];
	const row = (cells: string[], bold = false) => {
		if (doc.y > doc.page.height - doc.page.margins.bottom - 20) doc.addPage();
		const y = doc.y;
		doc
			.font(bold ? 'serif-bold' : 'serif')
			.fontSize(9)
			.fillColor(INK);
		cells.forEach((cell, i) => doc.text(cell, x + columns[i], y, { width: 120, lineBreak: false }));
		doc.x = x;
		doc.y = y + 13;
	};
	row(['Schmidt number k', 'bound', 'margin (SE)', 'critical visibility'], true);
	for (const b of m.result.bounds)
		row([
			String(b.upToSchmidtNumber),
			num(b.bound, 6),
			b.marginInStandardErrors === null ? 'n/a' : num(b.marginInStandardErrors, 3),
			num(b.criticalVisibility)
		]);
}

function verdict(doc: Doc, m: EvidenceManifest) {
	heading(doc, 'Result');
	doc.font('serif-bold').fontSize(13).fillColor(ACCENT);
	doc.text(`Certified Schmidt number: ${m.result.certifiedSchmidtNumber}`);
	const bases = calibrationLine(m.result);
	if (bases) doc.font('serif').fontSize(9.5).fillColor(INK).text(bases);
	doc.font('serif-bold').fontSize(13).fillColor(ACCENT);
	const claim = m.result.claim;
	const said = claim
		? `Verdict on the claimed ${claim.schmidtNumber}: ${claim.verdict}`
		: 'No claim was judged';
	doc.fillColor(INK).text(said);
	if (claim?.shortfall) doc.font('serif').fontSize(9.5).text(claim.shortfall);
	heading(doc, 'Cautions');
	for (const line of [
		...assumptionsOf(m.result.trust, m.result.backgroundSubtracted),
		...m.result.warnings
	])
		doc.font('serif').fontSize(9).fillColor(INK).text(`- ${line}`, { indent: 0 });
}

function signatureBlock(doc: Doc, input: PdfInput) {
	heading(doc, 'Signature');
	field(doc, 'Algorithm', 'Ed25519 over the canonical manifest (RFC 8785)');
	field(doc, 'Signing key id', input.manifest.signingKeyId);
	doc
		.font('serif')
		.fontSize(8)
		.fillColor(INK)
		.text(input.signature.slice(0, 64))
		.text(input.signature.slice(64));
	field(doc, 'Verify at', input.verifyUrl);
	doc
		.font('serif')
		.fontSize(8.5)
		.fillColor(MUTED)
		.text('Offline: unzip the evidence bundle and run `node verify.mjs` in its folder.');
}

/** Renders the certificate and resolves with the PDF bytes. */
export function certificatePdf(input: PdfInput): Promise<Buffer> {
	const doc = new PDFDocument({
		size: 'A4',
		margin: 56,
		bufferPages: true,
		info: {
			Title: `Rankseal certificate ${input.manifest.certificateId}`,
			Author: 'Rankseal',
			CreationDate: new Date(input.manifest.issuedAt)
		}
	});
	doc.registerFont('serif', fontFile(400));
	doc.registerFont('serif-bold', fontFile(700));
	const chunks: Buffer[] = [];
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('data', (chunk: Buffer) => chunks.push(chunk));
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});
	identity(doc, input);
	claimAndMethod(doc, input.manifest);
	statisticAndLadder(doc, input.manifest);
	boundsTable(doc, input.manifest);
	verdict(doc, input.manifest);
	drawAnalyses(doc, input.manifest);
	signatureBlock(doc, input);
	numberPages(doc, `Certificate ${input.manifest.certificateId}`);
	doc.end();
	return done;
}
