// Minimal types for the one call the citation tests make to an outside BibTeX parser.
declare module '@orcid/bibtex-parse-js' {
	export function toJSON(
		text: string
	): { citationKey: string; entryType: string; entryTags: Record<string, string> }[];
}
