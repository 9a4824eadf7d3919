/**
 * The one rule for text people type, used by every zod schema and service that takes a name,
 * title, reference, reason or comment. One-line fields (names, titles, references, labels)
 * refuse line breaks, since they go into mail subjects, PDF lines and CSV cells; multi-line
 * fields (descriptions, reasons, comments) keep them. Both refuse other control characters
 * (NUL among them), the bidi embedding, override and isolate controls (U+202A–U+202E,
 * U+2066–U+2069: they can make text read differently from what it is, "Trojan Source",
 * CVE-2021-42574) and unpaired surrogates. Everything else (combining marks, emoji, any script,
 * the direction marks U+200E/U+200F) is carried as typed.
 */
import { z } from 'zod';

export type TextShape = 'line' | 'lines';

const LINE_BREAK = /[\n\r\v\f\u0085\u2028\u2029]/u;
const CONTROL_IN_LINE = /[\u0000-\u001f\u007f-\u009f]/u;
const CONTROL_IN_LINES = /[\u0000-\u0008\u000e-\u001f\u007f-\u0084\u0086-\u009f]/u;
const BIDI_CONTROL = /[\u202a-\u202e\u2066-\u2069]/u;
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

const codePoint = (character: string) =>
	'U+' + character.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0');

/** What is wrong with the text, as the end of a sentence after its label; null when it is fine. */
export function textProblem(value: string, shape: TextShape): string | null {
	if (LONE_SURROGATE.test(value))
		return 'holds a broken character (an unpaired surrogate); retype it.';
	if (shape === 'line' && LINE_BREAK.test(value)) return 'must be one line; remove the line break.';
	const control = (shape === 'line' ? CONTROL_IN_LINE : CONTROL_IN_LINES).exec(value);
	if (control) return `holds a control character (${codePoint(control[0])}); remove it.`;
	const bidi = BIDI_CONTROL.exec(value);
	if (bidi) return `holds a text-direction control (${codePoint(bidi[0])}); remove it.`;
	return null;
}

/** A zod check for a string field: "The title must be one line; remove the line break." */
export const textRule =
	(label: string, shape: TextShape) =>
	(value: string, ctx: z.RefinementCtx): void => {
		const problem = textProblem(value, shape);
		if (problem) ctx.addIssue({ code: 'custom', message: `${label} ${problem}` });
	};

/** The same rule where a service checks a value itself: the trimmed text, or the message. */
export function checkedText(
	value: string,
	label: string,
	shape: TextShape
): { text: string; problem: string | null } {
	const text = value.trim();
	const problem = textProblem(text, shape);
	return { text, problem: problem && `${label} ${problem}` };
}

/**
 * A file's name as a browser or script sent it: not typed by a person, so tidied rather than
 * refused. Line breaks, control and text-direction characters become "_", a broken character
 * U+FFFD; blank becomes the fallback.
 */
export function tidyFileName(name: string, fallback: string, max = 200): string {
	const tidy = name
		.replace(new RegExp(LONE_SURROGATE.source, 'g'), '\ufffd')
		.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/gu, '_')
		.trim();
	return (tidy || fallback).slice(0, max);
}
