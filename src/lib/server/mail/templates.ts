/**
 * E-mail templates under templates/mail/: <name>.txt (a first line "Subject: …", a blank line, the
 * plain-text body) and <name>.html (a first line "Title: …", a blank line, the HTML body that
 * layout.html frames; the notices have no title line and go out unframed), with {{placeholder}}
 * fields. Every value but `link` is text: HTML-escaped in the HTML body, and defused in both bodies
 * when it looks like an address, so that a name a user chose never becomes a link. Bundled at
 * build time.
 */
const sources = import.meta.glob('/templates/mail/*.{txt,html}', {
	query: '?raw',
	import: 'default',
	eager: true
}) as Record<string, string>;

export type NoticeTemplate =
	| 'notice-claim-shared'
	| 'notice-report-filed'
	| 'notice-report-released'
	| 'notice-certificate-under-review';

export type MailTemplate =
	| 'verify-email'
	| 'reset-password'
	| 'reset-no-account'
	| 'signup-existing'
	| 'invitation'
	| 'password-changed'
	| 'certificate-issued'
	| 'certificate-superseded'
	| 'claim-withdrawn'
	| NoticeTemplate;

export interface RenderedMail {
	subject: string;
	text: string;
	html: string;
}

/** The one field that may be a link: the address the message is about. */
export const LINK_FIELD = 'link';

/** Replaces every {{name}}; a placeholder without a value is a programming error, so it throws. */
export function fillPlaceholders(
	source: string,
	values: Record<string, string>,
	encode: (value: string, key: string) => string = (value) => value
): string {
	return source.replace(/\{\{\s*([a-zA-Z][\w-]*)\s*\}\}/g, (_, key: string) => {
		const value = values[key];
		if (value === undefined) throw new Error(`mail template: no value for {{${key}}}`);
		return encode(value, key);
	});
}

export const escapeHtml = (value: string): string =>
	value
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/"/g, '&quot;')
		.replace(/'/g, '&#39;');

const ZERO_WIDTH_SPACE = '\u200b';
const LOOKS_LIKE_ADDRESS = /:\/\/|www\.|[\p{L}\p{N}-]\.[\p{L}]{2,}|@/iu;

/**
 * A user-chosen value that a mail program might turn into a link ("evil.example/reset",
 * "http://…") gets a zero-width space after each dot, colon, slash and @: it reads the same and
 * links nowhere. Ordinary names are left alone.
 */
export function defuseLinks(value: string): string {
	return LOOKS_LIKE_ADDRESS.test(value)
		? value.replace(/[.:/@]/g, (c) => c + ZERO_WIDTH_SPACE)
		: value;
}

const asText = (value: string, key: string) => (key === LINK_FIELD ? value : defuseLinks(value));
const asHtml = (value: string, key: string) => escapeHtml(asText(value, key));

function source(name: MailTemplate | 'layout', extension: 'txt' | 'html'): string {
	const text = sources[`/templates/mail/${name}.${extension}`];
	if (text === undefined) throw new Error(`mail template ${name}.${extension} is missing`);
	return text.replace(/\r\n/g, '\n');
}

/** A header value on one line: each run of breaks, spaces and control characters, one space. */
const oneLine = (value: string) => value.replace(/[\s\u0000-\u001f\u007f-\u009f]+/g, ' ').trim();

/** The HTML source put together before any value goes in, so every value is escaped alike. */
function htmlSource(name: MailTemplate): string {
	const own = source(name, 'html');
	const match = /^Title:[ \t]*([^\n]*)\n\n?/.exec(own);
	if (!match) return own;
	const parts = {
		'mail-title': match[1].trim(),
		'mail-body': own.slice(match[0].length).trimEnd()
	};
	return fillPlaceholders(source('layout', 'html'), parts);
}

/** Subject, text and HTML bodies of one message; the subject is plain text like the text body. */
export function renderTemplate(name: MailTemplate, values: Record<string, string>): RenderedMail {
	const own = source(name, 'txt');
	// Split before filling: a value with a line break (CR, U+2028…) must not move the subject line.
	const match = /^Subject:[ \t]*([^\n]*)\n\n?/.exec(own);
	if (!match) throw new Error(`mail template ${name}.txt must start with a "Subject:" line`);
	const subject = oneLine(fillPlaceholders(match[1], values, asText));
	const text = fillPlaceholders(own.slice(match[0].length), values, asText);
	const html = fillPlaceholders(htmlSource(name), values, asHtml);
	return { subject, text, html };
}
