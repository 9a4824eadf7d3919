/**
 * Content-Disposition for a download (RFC 6266): an ASCII `filename` every client reads, and the
 * exact name as `filename*` (RFC 8187). A header holds bytes only, so a name with "é", an emoji
 * or a line break must never go in raw (fetch's Headers refuses it: a 500).
 */
export function attachment(filename: string): string {
	const ascii = filename.replace(/[^\x20-\x7e]|["\\]/g, '_');
	return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}
