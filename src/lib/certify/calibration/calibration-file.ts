/**
 * The calibration file (witnesses.md §4.4): the basis vectors a set-up actually implements,
 *   {"dimension": d, "bases": [{"basis": t, "vectors": [[[re, im], …d entries…], …d vectors…]}],
 *    "tolerance": ε}
 * vectors[j][m] = ⟨m|j_t⟩, the m-th component of the vector side A projects on for outcome j (side
 * B measures its complex conjugate); ε bounds the error of every overlap |⟨a_t|b_s⟩|² derived from
 * them. Errors name the JSON field.
 */
import { InputError } from '../counts';

export const MAX_CALIBRATION_BYTES = 8 * 1024 * 1024;
/** The Gram matrix is (m·d)²; its certified eigenvalue bound costs (m·d)³/3 (docs/statistics.md §9). */
export const MAX_CALIBRATED_SIZE = 1024;
/** Largest ε accepted: beyond it no rung of the ladder can be passed anyway. */
export const MAX_CALIBRATION_TOLERANCE = 0.1;

/** One measured basis: re[j·d + m], im[j·d + m] = ⟨m|j_t⟩, as in bases.ts. */
export interface CalibratedBasis {
	basis: number;
	re: Float64Array;
	im: Float64Array;
}

export interface Calibration {
	dimension: number;
	bases: CalibratedBasis[];
	tolerance: number;
}

const fail = (path: string, message: string): never => {
	throw new InputError(`calibration ${path}: ${message}`);
};

const isRecord = (x: unknown): x is Record<string, unknown> =>
	typeof x === 'object' && x !== null && !Array.isArray(x);

function onlyKeys(x: Record<string, unknown>, keys: string[], path: string): void {
	for (const key of Object.keys(x))
		if (!keys.includes(key)) fail(`${path}.${key}`, 'unknown field');
}

function readVectors(x: unknown, d: number, path: string): { re: Float64Array; im: Float64Array } {
	if (!Array.isArray(x) || x.length !== d) fail(path, `expected ${d} vectors`);
	const re = new Float64Array(d * d);
	const im = new Float64Array(d * d);
	(x as unknown[]).forEach((vector, j) => {
		if (!Array.isArray(vector) || vector.length !== d)
			fail(`${path}[${j}]`, `expected ${d} entries [re, im]`);
		(vector as unknown[]).forEach((entry, m) => {
			const at = `${path}[${j}][${m}]`;
			if (!Array.isArray(entry) || entry.length !== 2) fail(at, 'expected [re, im]');
			const [a, b] = entry as unknown[];
			if (typeof a !== 'number' || typeof b !== 'number' || !isFinite(a) || !isFinite(b))
				fail(at, 'expected two finite numbers [re, im]');
			re[j * d + m] = a as number;
			im[j * d + m] = b as number;
		});
	});
	return { re, im };
}

function readBasis(x: unknown, d: number, i: number): CalibratedBasis {
	const path = `$.bases[${i}]`;
	if (!isRecord(x)) return fail(path, 'expected an object with "basis" and "vectors"');
	onlyKeys(x, ['basis', 'vectors'], path);
	const t = x.basis;
	if (typeof t !== 'number' || !Number.isInteger(t) || t < 0 || t > d)
		fail(`${path}.basis`, `expected a basis index from 0 to ${d}, got ${String(t)}`);
	return { basis: t as number, ...readVectors(x.vectors, d, `${path}.vectors`) };
}

export function decodeCalibrationText(input: Uint8Array | string): string {
	if (typeof input !== 'string' && input.byteLength > MAX_CALIBRATION_BYTES)
		fail('$', `the file is larger than ${MAX_CALIBRATION_BYTES} bytes`);
	const text =
		typeof input === 'string' ? input : new TextDecoder('utf-8', { fatal: false }).decode(input);
	return text.replace(/^\uFEFF/, '');
}

export function parseCalibration(input: Uint8Array | string, dimension?: number): Calibration {
	let root: unknown;
	try {
		root = JSON.parse(decodeCalibrationText(input));
	} catch (error) {
		return fail('$', `not valid JSON (${(error as Error).message})`);
	}
	if (!isRecord(root))
		return fail('$', 'expected an object with "dimension", "bases", "tolerance"');
	onlyKeys(root, ['dimension', 'bases', 'tolerance'], '$');
	const d = root.dimension;
	if (typeof d !== 'number' || !Number.isInteger(d) || d < 2 || d > 256)
		fail('$.dimension', `expected a whole number from 2 to 256, got ${String(d)}`);
	if (dimension !== undefined && d !== dimension)
		fail('$.dimension', `the calibration is for d = ${d}, the counts for d = ${dimension}`);
	const eps = root.tolerance;
	if (typeof eps !== 'number' || !(eps >= 0 && eps <= MAX_CALIBRATION_TOLERANCE))
		fail(
			'$.tolerance',
			`expected a number from 0 to ${MAX_CALIBRATION_TOLERANCE}, got ${String(eps)}`
		);
	if (!Array.isArray(root.bases) || root.bases.length === 0)
		fail('$.bases', 'expected a non-empty array of bases');
	const bases = (root.bases as unknown[]).map((b, i) => readBasis(b, d as number, i));
	const seen = new Set<number>();
	bases.forEach((b, i) => {
		if (seen.has(b.basis)) fail(`$.bases[${i}].basis`, `basis ${b.basis} is given twice`);
		seen.add(b.basis);
	});
	return { dimension: d as number, bases, tolerance: eps as number };
}
