/**
 * The one rule for typed text (src/lib/text-rules.ts), a mail subject built from a value stored
 * before the rule, and a download's Content-Disposition (RFC 6266 with RFC 8187's filename*).
 * The bidi controls refused are those of "Trojan Source" (CVE-2021-42574).
 */
import { describe, expect, it } from 'vitest';
import { attachment } from '../../src/lib/server/http/attachment';
import { renderTemplate } from '../../src/lib/server/mail/templates';
import { textProblem } from '../../src/lib/text-rules';

describe('the rule for one-line and multi-line text', () => {
	it('refuses breaks in one line, keeps them in several, and refuses controls in both', () => {
		expect(textProblem('a\u2028b', 'line')).toBe('must be one line; remove the line break.');
		expect(textProblem('a\u2028b\r\nc', 'lines')).toBeNull();
		expect(textProblem('a\u202eb', 'lines')).toBe(
			'holds a text-direction control (U+202E); remove it.'
		);
		expect(textProblem('a\u0000b', 'lines')).toBe('holds a control character (U+0000); remove it.');
		expect(textProblem('a\ud800', 'line')).toMatch(/unpaired surrogate/);
		expect(textProblem('e\u0301 👩‍🔬 日本語 \u200f', 'line')).toBeNull();
	});
});

describe('a claim stored before the rule', () => {
	it('still gets its letters: a title with CR or U+2028 keeps the subject on one line', () => {
		const title = 'Pairs\r at\u2028 1550\u2029nm\r\n';
		const values = {
			title,
			name: 'Ines',
			group: 'HLP',
			by: 'Ada',
			reason: 'Why\u2028not',
			link: 'x'
		};
		const mail = renderTemplate('claim-withdrawn', values);
		expect(mail.subject).toBe('Claim "Pairs at 1550 nm " withdrawn');
		expect(mail.text).toContain('Why\u2028not');
	});
});

describe('a download named by its uploader', () => {
	it('gets a Content-Disposition a header can hold, with the exact name in filename* (RFC 8187)', () => {
		const name = 'données "1" 😀\u2028.csv';
		const headers = new Headers({ 'content-disposition': attachment(name) });
		const value = headers.get('content-disposition')!;
		expect(value).toMatch(/^attachment; filename="donn_es _1_ __.\.csv"/);
		expect(decodeURIComponent(value.split("filename*=UTF-8''")[1])).toBe(name);
	});
});
