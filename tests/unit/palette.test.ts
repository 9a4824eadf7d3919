/**
 * Every text colour of the palette against its backgrounds, by the WCAG 2.x contrast ratio:
 * (L1 + 0.05)/(L2 + 0.05) with L the relative luminance of sRGB (WCAG 2.1, "relative luminance"
 * definition; AA for normal text is 4.5:1, success criterion 1.4.3).
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { palette, textPairs } from '../../src/lib/palette.js';

type Rgb = [number, number, number];

const rgb = (hex: string): Rgb => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)) as Rgb;

/** WCAG 2.1 relative luminance (the 0.03928 threshold as printed there; 0.04045 gives the same here). */
function luminance([r, g, b]: Rgb): number {
	const channel = (c: number) => {
		const s = c / 255;
		return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
	};
	return 0.2126 * channel(r) + 0.7152 * channel(g) + 0.0722 * channel(b);
}

const contrast = (a: Rgb, b: Rgb) => {
	const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
	return (hi + 0.05) / (lo + 0.05);
};

/** A Tailwind colour name such as "ink-soft" or "paper" to its hex value. */
function named(name: string): string {
	if (name.startsWith('#')) return name;
	const [base, shade = 'DEFAULT'] = name.split('-');
	const entry = (palette as Record<string, string | Record<string, string>>)[base];
	const hex = typeof entry === 'string' ? entry : entry?.[shade];
	if (!hex) throw new Error(`no colour ${name} in the palette`);
	return hex;
}

/** A colour laid over paper with opacity `alpha`, as Tailwind's bg-x/NN paints it. */
function over(name: string, alpha: number): Rgb {
	const top = rgb(named(name));
	const paper = rgb(palette.paper);
	return top.map((c, i) => Math.round(alpha * c + (1 - alpha) * paper[i])) as Rgb;
}

describe('the contrast formula', () => {
	it('gives the published extremes and the AA edge (WCAG 2.1 §1.4.3; common practice)', () => {
		expect(contrast(rgb('#000000'), rgb('#ffffff'))).toBeCloseTo(21, 10);
		expect(contrast(rgb('#777777'), rgb('#777777'))).toBe(1);
		// #767676 on white is the usual "lightest grey that passes AA": 4.54:1 (common practice).
		expect(contrast(rgb('#767676'), rgb('#ffffff'))).toBeCloseTo(4.54, 2);
		expect(contrast(rgb('#777777'), rgb('#ffffff'))).toBeLessThan(4.5);
	});
});

describe('the palette', () => {
	it.each(textPairs)('$text on $on ($where) reaches AA, 4.5:1', ({ text, on }) => {
		const background = Array.isArray(on) ? over(on[0], on[1]) : rgb(named(on));
		expect(contrast(rgb(named(text)), background)).toBeGreaterThanOrEqual(4.5);
	});

	it('is the only ink the pages use for text: no faded ink or light amber as a text colour', () => {
		const faded =
			/\btext-(ink|seal|copper)\/\d+|\bfill-ink\/\d+|\btext-amber(?!-dark)\b|\btext-(seal|copper)-light\b/;
		const offenders: string[] = [];
		const walk = (dir: string) => {
			for (const name of readdirSync(dir)) {
				const file = path.join(dir, name);
				if (statSync(file).isDirectory()) walk(file);
				else if (file.endsWith('.svelte'))
					readFileSync(file, 'utf8')
						.split('\n')
						.forEach((line, i) => {
							if (faded.test(line)) offenders.push(`${file}:${i + 1}: ${line.trim()}`);
						});
			}
		};
		walk(path.resolve('src'));
		expect(offenders).toEqual([]);
	});
});
