/**
 * The archive as files: CSV (RFC 4180, one row per claim version) and JSON. Text cells that a
 * spreadsheet would read as a formula (= + - @, tab, carriage return first) get a leading
 * apostrophe, as is common practice against formula injection.
 */
import type { Archive, ArchiveClaim, ArchiveVersion } from './archive';

export const CSV_COLUMNS = [
	'claim_id',
	'title',
	'state',
	'method',
	'dimension',
	'fourier',
	'claimed_schmidt_number',
	'source',
	'manuscript',
	'created_at',
	'withdrawn_at',
	'withdrawn_reason',
	'version',
	'version_status',
	'version_at',
	'certificate_id',
	'fingerprint',
	'certified_schmidt_number',
	'check_id'
] as const;

type Cell = string | number | null;

/** A text cell a spreadsheet could take for a formula gets a leading apostrophe. */
export const defuseFormula = (text: string): string =>
	/^[=+\-@\t\r]/.test(text) ? `'${text}` : text;

/** One CSV field: numbers as they are, text defused, quoted when it holds " , CR or LF. */
export function csvField(value: Cell): string {
	if (value === null) return '';
	if (typeof value === 'number') return String(value);
	const text = defuseFormula(value);
	return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function csvRow(claim: ArchiveClaim, version: ArchiveVersion | null): Cell[] {
	return [
		claim.id,
		claim.title,
		claim.state,
		claim.method,
		claim.dimension,
		claim.fourier,
		claim.claimedSchmidtNumber,
		claim.sourceDescription,
		claim.manuscriptReference,
		claim.createdAt,
		claim.withdrawnAt,
		claim.withdrawnReason,
		version?.version ?? null,
		version?.status ?? null,
		version?.at ?? null,
		version?.certificateId ?? null,
		version?.fingerprint ?? null,
		version?.certifiedSchmidtNumber ?? null,
		version?.checkId ?? null
	];
}

/** CRLF line ends (RFC 4180); a claim without versions still has its row. */
export function archiveCsv(archive: Archive): string {
	const rows: Cell[][] = [[...CSV_COLUMNS]];
	for (const claim of archive.claims) {
		const versions = claim.versions.length ? claim.versions : [null];
		for (const version of versions) rows.push(csvRow(claim, version));
	}
	return rows.map((row) => row.map(csvField).join(',')).join('\r\n') + '\r\n';
}

export function archiveJson(archive: Archive, exportedAt: Date = new Date()): string {
	const document = {
		format: 'rankseal-archive/1',
		exportedAt: exportedAt.toISOString(),
		...archive
	};
	return JSON.stringify(document, null, 2) + '\n';
}

/** A download name with the group's name reduced to safe characters. */
export function archiveFilename(archive: Archive, extension: 'csv' | 'json'): string {
	const slug = archive.group.name
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-|-$/g, '');
	return `rankseal-archive-${slug || 'group'}.${extension}`;
}
