/**
 * The supermartingale's inner loop, block by block: the shared running moments of a block first,
 * then each rung over the block with its state in locals. Every M_n is the same double as in a
 * trial-by-trial loop: the same operations on the same operands, in the same order.
 */

/** M is kept as mantissa × 10^scale: rescaled by 10^±STEP, never overflowing over 10⁸ trials. */
const STEP = 100;
const UP = 1e100;
const DOWN = 1e-100;
/** Trials per block: the block's moments stay in the fast cache. */
export const BLOCK = 4096;
/** A margin far above the rounding of two products, so "capped" below is never wrongly claimed. */
const SURE = 1 + 1e-12;

/** Trial i's running mean and variance (of the trials before i) and its code, for one block. */
export class Moments {
	readonly mean = new Float64Array(BLOCK);
	readonly variance = new Float64Array(BLOCK);
	readonly x = new Float64Array(BLOCK);
	code: Uint16Array | Uint32Array = new Uint16Array(0);
	count = 0;
	meanLow = 0;
	meanHigh = 0;
	varianceHigh = 0;
	private sum: number;
	private squares: number;
	constructor(xMax: number) {
		this.sum = xMax / 2;
		this.squares = (xMax * xMax) / 4;
	}
	/** Trials from..to−1 (at most BLOCK), with the block's extremes of mean and variance. */
	fill(codes: Uint16Array | Uint32Array, values: Float64Array, from: number, to: number): void {
		let [sum, squares] = [this.sum, this.squares];
		let [low, high, varianceHigh] = [Infinity, -Infinity, -Infinity];
		for (let i = from, j = 0; i < to; i++, j++) {
			const mean = sum / (i + 1);
			const variance = squares / (i + 1);
			const x = values[codes[i]];
			this.mean[j] = mean;
			this.variance[j] = variance;
			this.x[j] = x;
			low = Math.min(low, mean);
			high = Math.max(high, mean);
			varianceHigh = Math.max(varianceHigh, variance);
			sum += x;
			squares += (x - mean) * (x - mean);
		}
		Object.assign(this, { sum, squares, meanLow: low, meanHigh: high, varianceHigh });
		this.code = codes.subarray(from, to);
		this.count = to - from;
	}
}

/** Running state of one rung's M (mantissa × 10^scale) and its peak. */
export class Wealth {
	m = 1;
	scale = 0;
	peak = 1;
	peakScale = 0;
	threshold = 1;
	/** 1 + cap·(values[c] − μ) by code c: the factor of every trial when the bet is capped. */
	readonly cappedFactor: Float64Array;
	constructor(
		readonly mu: number,
		readonly cap: number,
		values: Float64Array,
		readonly trace: Float64Array
	) {
		this.cappedFactor = values.map((x) => 1 + cap * (x - mu));
	}
}

/**
 * One rung over the block. When the bet is provably capped on every trial (gap ≥ gap_low > 0 and
 * gap/(σ² + gap²) ≥ gap_low/(σ²_high + gap_high²) > cap, both sides rounded up), λ_i = cap and
 * each trial's factor is looked up; the running mean left above μ often, so this is most rungs.
 */
export function betBlock(w: Wealth, b: Moments): void {
	const gapLow = b.meanLow - w.mu;
	const gapHigh = b.meanHigh - w.mu;
	if (!(gapHigh > 0)) return;
	if (gapLow > 0 && gapLow > w.cap * (b.varianceHigh + gapHigh * gapHigh) * SURE)
		betCapped(w, b.code, b.count);
	else betEach(w, b);
}

function betCapped(w: Wealth, code: Uint16Array | Uint32Array, count: number): void {
	const factor = w.cappedFactor;
	let { m, scale, peak, peakScale, threshold } = w;
	for (let j = 0; j < count; j++) {
		m *= factor[code[j]];
		if (m > UP || m < DOWN) {
			const up = m > UP;
			m *= up ? DOWN : UP;
			scale += up ? STEP : -STEP;
			threshold = peak * 10 ** (peakScale - scale);
		}
		if (m > threshold) {
			peak = threshold = m;
			peakScale = scale;
		}
	}
	Object.assign(w, { m, scale, peak, peakScale, threshold });
}

function betEach(w: Wealth, b: Moments): void {
	const { mu, cap } = w;
	const { mean, variance, x, count } = b;
	let { m, scale, peak, peakScale, threshold } = w;
	for (let j = 0; j < count; j++) {
		const gap = mean[j] - mu;
		if (gap > 0) {
			const lambda = Math.min(gap / (variance[j] + gap * gap), cap);
			m *= 1 + lambda * (x[j] - mu);
			if (m > UP || m < DOWN) {
				const up = m > UP;
				m *= up ? DOWN : UP;
				scale += up ? STEP : -STEP;
				threshold = peak * 10 ** (peakScale - scale);
			}
			if (m > threshold) {
				peak = threshold = m;
				peakScale = scale;
			}
		}
	}
	Object.assign(w, { m, scale, peak, peakScale, threshold });
}
