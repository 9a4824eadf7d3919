/** The small part of fontkit (pdfkit's own font reader) the certificate uses: which glyphs a face has. */
declare module 'fontkit' {
	export interface Font {
		hasGlyphForCodePoint(codePoint: number): boolean;
		characterSet: number[];
		getGlyph(id: number): { path: { commands: unknown[] }; name: string };
		numGlyphs: number;
	}
	export function openSync(path: string): Font;
	export function create(buffer: Buffer): Font;
}
