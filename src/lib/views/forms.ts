/** What every form action answers on failure (built by $lib/server/problems.ts). */

export type FieldErrors = Record<string, string>;

/** Which form, the message per field, what was sent. */
export interface FormProblem {
	action: string;
	errors: FieldErrors;
	values: Record<string, string>;
	/** The place in an uploaded counts file, when the problem is there. */
	place: { line: number | null; column: number | null } | null;
}
