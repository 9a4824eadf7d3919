/** Small drawing helpers for the certificate PDF: headings, label–value rows, the QR code. */
import QRCode from 'qrcode';
import { write } from './pdf-fonts';

type Doc = PDFKit.PDFDocument;

export const INK = '#1d2430';
export const MUTED = '#5a6473';
export const ACCENT = '#0b6e4f';

export function heading(doc: Doc, text: string): void {
	doc.moveDown(0.7).fontSize(11.5).fillColor(ACCENT);
	write(doc, text, 'bold');
	doc.moveDown(0.15).font('serif').fontSize(9.5).fillColor(INK);
}

/** One "label: value" line with the label muted; every character of the value gets a glyph. */
export function field(doc: Doc, label: string, value: string, size = 9.5): void {
	doc.fontSize(size).fillColor(MUTED);
	write(doc, `${label}: `, 'regular', { continued: true });
	doc.fillColor(INK);
	write(doc, value || '—', 'regular');
}

/** A paragraph in the given size and colour. */
export function paragraph(doc: Doc, text: string, size = 9, colour = INK): void {
	doc.fontSize(size).fillColor(colour);
	write(doc, text, 'regular');
}

/** The QR code of `text` as filled squares (vector, no image), `size` points wide. */
export function drawQr(doc: Doc, text: string, x: number, y: number, size: number): void {
	const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
	const quiet = 2;
	const cell = size / (modules.size + 2 * quiet);
	doc.rect(x, y, size, size).fill('#ffffff');
	for (let row = 0; row < modules.size; row++) {
		for (let col = 0; col < modules.size; col++) {
			if (modules.get(row, col))
				doc.rect(x + (col + quiet) * cell, y + (row + quiet) * cell, cell, cell);
		}
	}
	doc.fill(INK);
}

/** "page i of n" under every page (the document must buffer its pages). */
export function numberPages(doc: Doc, footer: string): void {
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const bottom = doc.page.margins.bottom;
		doc.page.margins.bottom = 0;
		doc.font('serif').fontSize(7.5).fillColor(MUTED);
		doc.text(
			`${footer} · page ${i + 1} of ${range.count}`,
			doc.page.margins.left,
			doc.page.height - 36,
			{
				width: doc.page.width - doc.page.margins.left - doc.page.margins.right,
				align: 'center',
				lineBreak: false
			}
		);
		doc.page.margins.bottom = bottom;
	}
}
