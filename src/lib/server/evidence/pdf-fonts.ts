/**
 * The certificate's faces: Noto Serif by script subset, then Noto Sans Math for what Noto Serif
 * has no glyph for (≥, ≤, ⟩, ≈). Text is cut into runs, each set in the first face that has
 * every glyph of it, so that a title or a name never prints an empty box.
 */
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import * as fontkit from 'fontkit';

type Doc = PDFKit.PDFDocument;
export type Weight = 'regular' | 'bold';

interface Face {
	name: string;
	file: string;
	font: fontkit.Font;
}

const SERIF_SUBSETS = ['latin', 'latin-ext', 'greek', 'greek-ext', 'math', 'cyrillic'];

function fontFile(name: string): string {
	try {
		return createRequire(import.meta.url).resolve(name);
	} catch {
		const local = path.resolve('node_modules', name);
		if (existsSync(local)) return local;
		throw new Error(`the certificate font is missing: ${name}`);
	}
}

function loadFaces(weight: Weight): Face[] {
	const number = weight === 'bold' ? 700 : 400;
	const base = weight === 'bold' ? 'serif-bold' : 'serif';
	const files = SERIF_SUBSETS.map(
		(subset) => `@fontsource/noto-serif/files/noto-serif-${subset}-${number}-normal.woff`
	);
	// Noto Sans Math comes in one weight: bold text borrows its regular glyphs.
	files.push('@fontsource/noto-sans-math/files/noto-sans-math-latin-400-normal.woff');
	return files.map((name, i) => {
		const file = fontFile(name);
		return { name: i === 0 ? base : `${base}-${i}`, file, font: fontkit.openSync(file) };
	});
}

const faces = new Map<Weight, Face[]>();

function facesOf(weight: Weight): Face[] {
	let list = faces.get(weight);
	if (!list) faces.set(weight, (list = loadFaces(weight)));
	return list;
}

/** Registers every face under its name ('serif', 'serif-1', ..., 'serif-bold', ...). */
export function registerFaces(doc: Doc): void {
	for (const weight of ['regular', 'bold'] as const)
		for (const face of facesOf(weight)) doc.registerFont(face.name, face.file);
}

const isSpace = (c: string) => /\s/u.test(c);

/** The face for one character: the first with its glyph, else the base face. */
function faceFor(list: Face[], char: string): string {
	const code = char.codePointAt(0)!;
	return (list.find((f) => f.font.hasGlyphForCodePoint(code)) ?? list[0]).name;
}

export interface Run {
	face: string;
	text: string;
}

/** Cuts `text` into runs of one face each; spaces stay in the run they follow. */
export function runsOf(text: string, weight: Weight): Run[] {
	const list = facesOf(weight);
	const runs: Run[] = [];
	for (const char of text) {
		const last = runs[runs.length - 1];
		const face = last && isSpace(char) ? last.face : faceFor(list, char);
		if (last && last.face === face) last.text += char;
		else runs.push({ face, text: char });
	}
	return runs;
}

/** Characters none of the faces can draw (they print with the base face's empty box). */
export function missingGlyphs(text: string): string[] {
	const list = facesOf('regular');
	const missing = [...text].filter(
		(c) => !isSpace(c) && !list.some((f) => f.font.hasGlyphForCodePoint(c.codePointAt(0)!))
	);
	return [...new Set(missing)];
}

/**
 * Writes `text` run by run at the current position (or at x, y), with pdfkit's own wrapping;
 * `options.continued` lets the caller go on in the same line.
 */
export function write(
	doc: Doc,
	text: string,
	weight: Weight,
	options: PDFKit.Mixins.TextOptions = {},
	at?: { x: number; y: number }
): Doc {
	const runs = runsOf(text, weight);
	if (runs.length === 0) runs.push({ face: weight === 'bold' ? 'serif-bold' : 'serif', text: '' });
	runs.forEach((run, i) => {
		const last = i === runs.length - 1;
		const opts = { ...options, continued: last ? (options.continued ?? false) : true };
		doc.font(run.face);
		if (i === 0 && at) doc.text(run.text, at.x, at.y, opts);
		else doc.text(run.text, opts);
	});
	return doc;
}
