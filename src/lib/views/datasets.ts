/** What callers see of an uploaded counts file and of the analyses run on it. */
import type { AnalysisSettings } from '$lib/evidence/analyses';

/** What the upload held, for previews and the claim page (the bytes themselves are on disk). */
export interface DatasetSummary {
	dimension: number;
	bases: number[];
	totals: Record<string, number>;
	hasAccidentals: boolean;
	hasDurations: boolean;
	/** Methods whose table requirements the file meets. */
	allows: string[];
	/** How a detected layout was read ("read as 3 grids of 5 × 5, tab-separated"); grid files only. */
	readAs?: string;
}

/** One basis of a dataset as the heat map shows it: counts[a][b]. */
export interface PreviewTable {
	basis: number;
	total: number;
	counts: number[][];
	/** Outcomes per shown cell along each side (sums of block × block cells); absent: 1. */
	block?: number;
}

export interface DatasetView {
	id: string;
	claimId: string;
	sha256: string;
	byteSize: number;
	format: 'csv' | 'json';
	originalName: string;
	createdAt: string;
	summary: DatasetSummary;
	/** SHA-256 of the calibration file uploaded beside the counts (witnesses.md §4.4), or null. */
	calibrationSha256: string | null;
}

export interface DatasetTables {
	dimension: number;
	/** One d×d table per basis: counts[a][b]. */
	tables: PreviewTable[];
}

/** One check on a counts file, as the record of analyses lists it. */
export interface AnalysisRun {
	checkId: string;
	claimId: string;
	settings: AnalysisSettings;
	seed: number;
	seedChoice: number | 'derived';
	/** The account that started it (null: a removed account). */
	ranBy: string | null;
	ranAt: string;
}

export interface CountsRecord {
	countsSha256: string;
	/** Distinct analyses so far (what the next certificate from these counts would count). */
	distinct: number;
	/** Every check, oldest first, with the name of who ran it and the claim it belongs to. */
	runs: (AnalysisRun & { ranByName: string; claimTitle: string })[];
}
