/**
 * Reading an uploaded counts file, on a worker thread (a 20 MiB file takes seconds to parse):
 * checks it against the claim and returns what the pages show — totals, bases, methods the
 * file allows, and heat-map tables — so that no page view parses the file again.
 * Relative imports only: this is bundled into the check worker.
 */
import {
	checkDeclaredFourier,
	DEFAULT_FOURIER,
	METHOD_IDS,
	parseCounts,
	witnessFamilies,
	type CountsDataset,
	type FourierConvention
} from '../../certify';
import { InputError, requireCompleteTables } from '../../certify/counts';
import { isCountsSet } from '../../certify/counts-set';
import { requireSeparateRun } from '../../certify/fidelity-target/fit';
import { fileDimension } from '../../certify/file-dimension';
import type { ClaimMethod } from '../../claims/target';
import { sha256Hex } from '../../evidence/hash';
import { canonicalCountsText } from '../../evidence/manifest';
import type { DatasetSummary, PreviewTable } from '../db/models/Dataset';

export interface SummaryTask {
	bytes: Uint8Array;
	dimension: number;
	method: ClaimMethod;
	bases: number[];
	/** The claim's Fourier convention (which basis basis 1 is). */
	fourier: FourierConvention;
	/** Set for a claim on time-ordered trials: read by summariseTrials instead. */
	trials?: { mode: 'trials' | 'blocks'; probabilities: number[] | null } | null;
	/** fidelity-target: the calibration run λ was fitted on; the counts may not be it (§9). */
	separateFrom?: { bytes: Uint8Array; sha256: string } | null;
}

export type SummaryOutcome =
	| { ok: true; summary: DatasetSummary; preview: PreviewTable[]; countsSha256: string }
	| { ok: false; message: string; line: number | null; column: number | null };

/** Heat maps kept per dataset: the claim's bases first, then others while this many cells fit. */
export const MAX_PREVIEW_CELLS = 1 << 20;

export function summarise(
	dataset: CountsDataset,
	fourier: FourierConvention = DEFAULT_FOURIER
): DatasetSummary {
	const d = dataset.dimension;
	const present = dataset.tables.map((t) => t.basis);
	const allows = METHOD_IDS.filter((method) => {
		const family = witnessFamilies[method];
		try {
			const bases = family.defaultBases(present, d);
			family.checkBases(bases, d, fourier);
			requireCompleteTables(dataset, bases, method);
			return true;
		} catch {
			return false;
		}
	});
	return {
		dimension: d,
		bases: present,
		totals: Object.fromEntries(
			dataset.tables.map((t) => [String(t.basis), t.counts.reduce((s, c) => s + c, 0)])
		),
		hasAccidentals: dataset.tables.some((t) => t.accidentals !== null),
		hasDurations: dataset.tables.some((t) => t.durations !== null),
		allows,
		...(dataset.readAs ? { readAs: dataset.readAs } : {})
	};
}

export function previewTables(dataset: CountsDataset, first: number[] = []): PreviewTable[] {
	const d = dataset.dimension;
	const rank = (basis: number) => (first.includes(basis) ? first.indexOf(basis) : first.length);
	const ordered = [...dataset.tables].sort((x, y) => rank(x.basis) - rank(y.basis));
	const side = Math.ceil(d / Math.ceil(d / PREVIEW_SIDE));
	const kept = ordered.slice(0, Math.max(1, Math.floor(MAX_PREVIEW_CELLS / (side * side))));
	return kept
		.sort((x, y) => x.basis - y.basis)
		.map((t) => ({
			basis: t.basis,
			total: t.counts.reduce((s, c) => s + c, 0),
			...blockSums(t.counts, d)
		}));
}

/** A heat map shows at most this many cells along a side; larger tables are summed in blocks. */
export const PREVIEW_SIDE = 256;

/** The table as rows for a heat map: cell by cell up to PREVIEW_SIDE, else sums of b × b blocks. */
export function blockSums(counts: Float64Array, d: number): { counts: number[][]; block: number } {
	const block = Math.ceil(d / PREVIEW_SIDE);
	const side = Math.ceil(d / block);
	const rows = Array.from({ length: side }, () => new Array<number>(side).fill(0));
	for (let a = 0; a < d; a++) {
		const row = rows[Math.floor(a / block)];
		for (let b = 0; b < d; b++) row[Math.floor(b / block)] += counts[a * d + b];
	}
	return { counts: rows, block };
}

/**
 * Says "the file is d = 5, the claim is d = 11" rather than what the mismatch broke first. In
 * CSV only when no line is at fault: a bad row (a typo in an outcome) is named by its line.
 */
function dimensionProblem(
	bytes: Uint8Array,
	claimed: number,
	cause: InputError
): InputError | null {
	// A counts set's files each name their own faults (counts-set.ts); the set has no one dimension.
	if (isCountsSet(bytes)) return null;
	const found = fileDimension(bytes);
	if (found === null || found === claimed) return null;
	const json = new TextDecoder().decode(bytes.subarray(0, 64)).trimStart().startsWith('{');
	if (!json && (cause.line !== undefined || found > claimed)) return null;
	return new InputError(`the file is d = ${found}, the claim is d = ${claimed}`);
}

export function summariseCounts(task: SummaryTask): SummaryOutcome {
	try {
		try {
			const parsed = parseCounts(task.bytes, task.dimension);
			checkDeclaredFourier(parsed, task.fourier, 'the claim');
			requireCompleteTables(parsed, task.bases, task.method);
			const run = task.separateFrom;
			if (run)
				requireSeparateRun(
					parseCounts(run.bytes, task.dimension),
					run.sha256,
					parsed,
					sha256Hex(task.bytes)
				);
			return {
				ok: true,
				summary: summarise(parsed, task.fourier),
				preview: previewTables(parsed, task.bases),
				// The counts' identity whatever the layout: the same table in two files is one file.
				countsSha256: sha256Hex(canonicalCountsText(parsed))
			};
		} catch (error) {
			throw (
				(error instanceof InputError && dimensionProblem(task.bytes, task.dimension, error)) ||
				error
			);
		}
	} catch (error) {
		if (!(error instanceof InputError)) throw error;
		// The receiving side rebuilds the InputError, which puts the line back in front.
		const message = error.message.replace(/^line \d+(, column \d+)?: /, '');
		return {
			ok: false,
			message,
			line: error.line ?? null,
			column: error.column ?? null
		};
	}
}
