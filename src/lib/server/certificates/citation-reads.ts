/** Citations of a certificate, for whoever may read its JSON (same permission check). */
import type { Actor } from '../core/actor';
import type { Database } from '../db';
import { getCertificate } from './certificate-reads';
import { ConflictError, FieldError } from '../core/errors';
import { CITATION_FORMATS, citationIn, dataAvailability, type CitationFormat } from './citation';
import { doiSubject, type DoiSubject } from './doi-subject';

async function subjectFor(database: Database, caller: Actor, id: string): Promise<DoiSubject> {
	await getCertificate(database, caller, id);
	const row = (await database.models.Certificate.findByPk(id))!.get({ plain: true });
	const subject = await doiSubject(database, row);
	// Only a certificate from before DOIs, between an upgrade and the next start (doi-backfill.ts).
	if (!subject)
		throw new ConflictError('This certificate has no DOI yet; it gets one at the next start.');
	return subject;
}

/** The format named by the query, or a FieldError naming `format`. */
export function citationFormat(value: string | null): CitationFormat {
	const format = (value ?? 'text') as CitationFormat;
	if (!CITATION_FORMATS.includes(format))
		throw new FieldError('format', `Ask for format=${CITATION_FORMATS.join(', format=')}.`);
	return format;
}

export async function certificateCitation(
	database: Database,
	caller: Actor,
	id: string,
	format: CitationFormat
): Promise<string> {
	return citationIn(await subjectFor(database, caller, id), format);
}

/** Every format at once and the data-availability sentence, for the certificate page. */
export async function certificateCitations(database: Database, caller: Actor, id: string) {
	const subject = await subjectFor(database, caller, id);
	return {
		text: citationIn(subject, 'text').trim(),
		bibtex: citationIn(subject, 'bibtex'),
		ris: citationIn(subject, 'ris'),
		dataAvailability: dataAvailability(subject)
	};
}
