/**
 * Citation text for a certificate: plain text in DataCite's recommended order (Creator
 * (PublicationYear). Title. Publisher. ResourceType. Identifier; common practice), BibTeX, RIS,
 * and a ready data-availability sentence naming the DOI, the counts' SHA-256 and the bundle.
 */
import { citationTitle, PUBLISHER, type DoiSubject } from './doi-subject';

export const CITATION_FORMATS = ['bibtex', 'ris', 'text'] as const;
export type CitationFormat = (typeof CITATION_FORMATS)[number];

export const CITATION_TYPES: Record<CitationFormat, string> = {
	bibtex: 'application/x-bibtex; charset=utf-8',
	ris: 'application/x-research-info-systems; charset=utf-8',
	text: 'text/plain; charset=utf-8'
};

const year = (s: DoiSubject) => s.issuedAt.slice(0, 4);
const statusNote = (s: DoiSubject) =>
	s.status === 'withdrawn' ? ' Withdrawn.' : s.status === 'superseded' ? ' Superseded.' : '';

export function citationText(s: DoiSubject): string {
	const names = s.creators.map((c) => c.name).join(', ') || PUBLISHER;
	return `${names} (${year(s)}). ${citationTitle(s)}. ${PUBLISHER}. Dataset. ${s.doiUrl}${statusNote(s)}`;
}

const BIBTEX_SPECIAL: Record<string, string> = {
	'\\': '\\textbackslash{}',
	'{': '\\{',
	'}': '\\}',
	'&': '\\&',
	'%': '\\%',
	$: '\\$',
	'#': '\\#',
	_: '\\_',
	'~': '\\textasciitilde{}',
	'^': '\\textasciicircum{}'
};
/** LaTeX's special characters escaped in one pass; ≥ as math so classic BibTeX copes too. */
const bibtexText = (text: string) =>
	text
		.replace(/[\\{}&%$#_~^]/g, (c) => BIBTEX_SPECIAL[c])
		.replace(/≥/g, '{$\\geq$}')
		.replace(/\s+/g, ' ');
/** A name with a comma or " and " in it is kept whole (braced), else BibTeX would split it. */
const bibtexName = (name: string) =>
	/,|\sand\s/i.test(name) ? `{${bibtexText(name)}}` : bibtexText(name);

export function citationBibtex(s: DoiSubject): string {
	const fields: [string, string][] = [
		['author', s.creators.map((c) => bibtexName(c.name)).join(' and ') || `{${PUBLISHER}}`],
		['title', `{${bibtexText(citationTitle(s))}}`],
		['year', year(s)],
		['publisher', PUBLISHER],
		['howpublished', 'Rankseal certificate (dataset)'],
		['doi', s.doi],
		['url', s.doiUrl],
		['note', bibtexText(`Certificate ${s.certificateId}.${statusNote(s)}`.trim())]
	];
	const body = fields.map(([k, v]) => `\t${k} = {${v}}`).join(',\n');
	return `@misc{rankseal-${s.certificateId.slice(0, 8)},\n${body}\n}\n`;
}

/** RIS: one "TAG  - value" a line, CRLF ends (common practice of the format), ER closes the entry. */
export function citationRis(s: DoiSubject): string {
	const flat = (text: string) => text.replace(/\s+/g, ' ').trim();
	const lines: [string, string][] = [
		['TY', 'DATA'],
		...s.creators.map((c): [string, string] => ['AU', flat(c.name)]),
		['TI', flat(citationTitle(s))],
		['PY', year(s)],
		['DA', s.issuedAt.slice(0, 10).replace(/-/g, '/')],
		['PB', PUBLISHER],
		['DO', s.doi],
		['UR', s.doiUrl],
		['N1', flat(`Certificate ${s.certificateId}.${statusNote(s)}`)],
		['ER', '']
	];
	return lines.map(([tag, value]) => `${tag}  - ${value}`).join('\r\n') + '\r\n';
}

export function citationIn(s: DoiSubject, format: CitationFormat): string {
	if (format === 'bibtex') return citationBibtex(s);
	if (format === 'ris') return citationRis(s);
	return citationText(s) + '\n';
}

/** For a manuscript's data-availability statement. */
export function dataAvailability(s: DoiSubject): string {
	return (
		`The raw coincidence counts behind the Schmidt-number certificate (SHA-256 ${s.countsSha256}) are contained in its evidence bundle ` +
		`${s.bundleName} (SHA-256 ${s.bundleSha256}), with the signed manifest, the result and an offline verifier; ` +
		`the certificate is identified by the DOI ${s.doi} (${s.doiUrl}).`
	);
}
