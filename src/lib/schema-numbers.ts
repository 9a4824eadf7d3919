/**
 * Numbers at the boundary. A form sends text, so its fields are read as numbers; a JSON body
 * has numbers of its own, so the API's schemas take only those: "0x100", [5], "5" and true are
 * refused naming the field, never coerced (readJson refuses 5.0 and 1e2 before any schema).
 */
import { z } from 'zod';

/** A blank form field reads as "not given" (undefined), for z.preprocess. */
export const blankToUndefined = (value: unknown) =>
	typeof value === 'string' && value.trim() === '' ? undefined : value;

/** Where the values come from: a submitted form (text) or a JSON body (typed). */
export type ValueSource = 'form' | 'json';

/** What a JSON value is, in a few words, for "… must be a number, not …". */
export function jsonKind(value: unknown): string {
	if (value === null) return 'null';
	if (Array.isArray(value)) return 'a list';
	if (typeof value === 'string') return `text (${JSON.stringify(value.slice(0, 40))})`;
	if (typeof value === 'boolean') return String(value);
	if (typeof value === 'number') return 'a number beyond the floating-point range';
	return typeof value === 'object' ? 'an object' : typeof value;
}

/** A number: from a form's text, or a JSON number as it was sent (finite). */
export const numberFrom = (label: string, source: ValueSource) =>
	source === 'form'
		? z.coerce.number({ error: `${label} must be a number.` })
		: z.number({
				error: (issue) =>
					issue.input === undefined
						? `${label} must be a number.`
						: `${label} must be a JSON number, not ${jsonKind(issue.input)}.`
			});

/** A whole number between min and max, with the label in every message. */
export const wholeNumber = (label: string, min: number, max: number, source: ValueSource) =>
	numberFrom(label, source)
		.int(`${label} must be a whole number.`)
		.min(min, `${label} must be at least ${min}.`)
		.max(max, `${label} must be at most ${max}.`);

/** A yes/no: a form's checkbox ("on" or nothing, or "true"/"false"); JSON's true or false only. */
export const booleanFrom = (label: string, source: ValueSource) =>
	source === 'form'
		? z.preprocess(
				(v) => (v === 'on' || v === 'true' ? true : v === '' || v === 'false' ? false : v),
				z.boolean({ error: `${label} must be true or false.` })
			)
		: z.boolean({
				error: (issue) => `${label} must be true or false, not ${jsonKind(issue.input)}.`
			});
