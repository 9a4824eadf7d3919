/**
 * Reads the fonts a PDF embeds and which characters each can draw: every font's ToUnicode map
 * (glyph id → characters) joined with its embedded font program (read by fontkit), so that a
 * character counts as drawn only when it maps to a real glyph (not .notdef, with an outline).
 */
import { execFileSync } from 'node:child_process';
import { inflateSync } from 'node:zlib';
import * as fontkit from 'fontkit';

interface PdfObject {
	dict: string;
	stream: Buffer | null;
}

/** Every indirect object of an uncompressed-xref PDF (pdfkit writes these). */
export function pdfObjects(pdf: Buffer): Map<number, PdfObject> {
	const text = pdf.toString('latin1');
	const objects = new Map<number, PdfObject>();
	const head = /(\d+) 0 obj\s*/g;
	for (let m = head.exec(text); m; m = head.exec(text)) {
		const start = m.index + m[0].length;
		const end = text.indexOf('endobj', start);
		const body = text.slice(start, end);
		const at = body.indexOf('stream');
		const dict = at >= 0 ? body.slice(0, at) : body;
		let stream: Buffer | null = null;
		if (at >= 0) {
			const length = Number(/\/Length (\d+)/.exec(dict)?.[1]);
			const from = start + at + 'stream'.length + (text[start + at + 6] === '\r' ? 2 : 1);
			const raw = pdf.subarray(from, from + length);
			stream = /\/FlateDecode/.test(dict) ? inflateSync(raw) : raw;
		}
		objects.set(Number(m[1]), { dict, stream });
	}
	return objects;
}

const ref = (dict: string, key: string) => {
	const m = new RegExp(`/${key} (\\d+) 0 R`).exec(dict);
	return m ? Number(m[1]) : null;
};

/** UTF-16 hex (pdfkit writes units apart: <d835 dc00>) to text. */
const hexChars = (hex: string) =>
	String.fromCharCode(...(hex.replace(/\s/g, '').match(/.{4}/g) ?? []).map((h) => parseInt(h, 16)));

/** Glyph id → characters from a ToUnicode CMap (bfchar and bfrange, both forms). */
export function toUnicode(cmap: string): Map<number, string> {
	const map = new Map<number, string>();
	for (const block of cmap.matchAll(/beginbfchar([\s\S]*?)endbfchar/g))
		for (const [, gid, uni] of block[1].matchAll(/<([0-9a-f]+)>\s*<([0-9a-f]+)>/gi))
			map.set(parseInt(gid, 16), hexChars(uni));
	for (const block of cmap.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
		const lines = block[1].matchAll(/<([0-9a-f]+)>\s*<([0-9a-f]+)>\s*(\[[^\]]*\]|<[0-9a-f]+>)/gi);
		for (const [, lo, hi, target] of lines) {
			const first = parseInt(lo, 16);
			const list = [...target.matchAll(/<([0-9a-f\s]*)>/gi)].map((x) => x[1]);
			for (let gid = first; gid <= parseInt(hi, 16); gid++) {
				if (target.startsWith('[')) map.set(gid, hexChars(list[gid - first]));
				else map.set(gid, String.fromCodePoint(parseInt(list[0], 16) + gid - first));
			}
		}
	}
	return map;
}

export interface EmbeddedFontGlyphs {
	baseFont: string;
	/** Characters this font draws with a real glyph. */
	drawn: Set<string>;
	/** Characters mapped to .notdef or to an empty outline. */
	blank: Set<string>;
}

/** Each Type0 font with its embedded program, and which characters it draws for real. */
export function embeddedGlyphs(pdf: Buffer): EmbeddedFontGlyphs[] {
	const objects = pdfObjects(pdf);
	const out: EmbeddedFontGlyphs[] = [];
	for (const { dict } of objects.values()) {
		if (!/\/Subtype \/Type0/.test(dict)) continue;
		const baseFont = /\/BaseFont \/(\S+)/.exec(dict)![1];
		const cmap = objects.get(ref(dict, 'ToUnicode')!)!.stream!.toString('latin1');
		const descendant = objects.get(Number(/\/DescendantFonts \[(\d+) 0 R\]/.exec(dict)![1]))!;
		const descriptor = objects.get(ref(descendant.dict, 'FontDescriptor')!)!;
		const program = objects.get(ref(descriptor.dict, 'FontFile2')!)!.stream!;
		const font = fontkit.create(program);
		const drawn = new Set<string>();
		const blank = new Set<string>();
		for (const [gid, chars] of toUnicode(cmap)) {
			if (!chars || chars === '\u0000') continue;
			const real =
				gid !== 0 && (font.getGlyph(gid).path.commands.length > 0 || /^\s$/u.test(chars));
			(real ? drawn : blank).add(chars);
		}
		out.push({ baseFont, drawn, blank });
	}
	return out;
}

/** poppler's view: every font's name, type and whether it is embedded. */
export function popplerFonts(file: string): { name: string; embedded: boolean }[] {
	const lines = execFileSync('pdffonts', [file], { encoding: 'utf8' }).trim().split('\n').slice(2);
	return lines.map((line) => {
		const cells = line.trim().split(/\s+/);
		return { name: cells[0], embedded: cells[cells.length - 5] === 'yes' };
	});
}
