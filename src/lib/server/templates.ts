/**
 * Plain-text e-mail templates from templates/mail/<name>.txt: a first line "Subject: …", a blank
 * line, then the body, with {{placeholder}} fields. Bundled at build time, so no file paths at run time.
 */
const sources = import.meta.glob('/templates/mail/*.txt', {
	query: '?raw',
	import: 'default',
	eager: true
}) as Record<string, string>;

export type NoticeTemplate =
	'notice-claim-shared' | 'notice-report-filed' | 'notice-report-released';

export type MailTemplate =
	'verify-email' | 'reset-password' | 'invitation' | 'password-changed' | NoticeTemplate;

export interface RenderedMail {
	subject: string;
	text: string;
}

/** Replaces every {{name}}; a placeholder without a value is a programming error, so it throws. */
export function fillPlaceholders(source: string, values: Record<string, string>): string {
	return source.replace(/\{\{\s*([a-zA-Z][\w-]*)\s*\}\}/g, (_, key: string) => {
		const value = values[key];
		if (value === undefined) throw new Error(`mail template: no value for {{${key}}}`);
		return value;
	});
}

export function renderTemplate(name: MailTemplate, values: Record<string, string>): RenderedMail {
	const source = sources[`/templates/mail/${name}.txt`];
	if (source === undefined) throw new Error(`mail template ${name}.txt is missing`);
	const filled = fillPlaceholders(source.replace(/\r\n/g, '\n'), values);
	const match = /^Subject:[ \t]*(.*)\n\n?/.exec(filled);
	if (!match) throw new Error(`mail template ${name}.txt must start with a "Subject:" line`);
	return { subject: match[1].trim(), text: filled.slice(match[0].length) };
}
