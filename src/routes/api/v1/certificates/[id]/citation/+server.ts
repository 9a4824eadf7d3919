import { apiEndpoint } from '$lib/server/http/api';
import { CITATION_TYPES } from '$lib/server/certificates/citation';
import { certificateCitation, citationFormat } from '$lib/server/certificates/citation-reads';

/** The certificate's citation as BibTeX, RIS or plain text (?format=); who may read it as its JSON. */
export const GET = apiEndpoint(async ({ event, actor, database }) => {
	const format = citationFormat(event.url.searchParams.get('format'));
	const body = await certificateCitation(database, actor, event.params.id!, format);
	const extension = { bibtex: 'bib', ris: 'ris', text: 'txt' }[format];
	return new Response(body, {
		headers: {
			'content-type': CITATION_TYPES[format],
			'content-disposition': `inline; filename="rankseal-certificate-${event.params.id}.${extension}"`
		}
	});
});
