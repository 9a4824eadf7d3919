/**
 * Convolution of two probability vectors, with a bound on its rounding error (the sum quantile,
 * docs/statistics.md): directly for small products, else by a radix-2 FFT. The FFT error bound
 * is the standard one, ‖error‖₂ ≲ c·u·log₂N·‖x‖₂‖y‖₂ (Higham, Accuracy and Stability of
 * Numerical Algorithms, 2nd ed. (2002), §24.1, from memory), turned into an L1 bound by √N and
 * taken ten times over; negative entries are set to 0, which only moves them towards the truth.
 */
const UNIT_ROUNDOFF = 2 ** -53;
const DIRECT_LIMIT = 200_000;

export interface Convolution {
	values: Float64Array;
	/** An upper bound on Σ|computed − exact| over the entries. */
	l1Error: number;
}

function direct(x: Float64Array, y: Float64Array): Convolution {
	const out = new Float64Array(x.length + y.length - 1);
	for (let i = 0; i < x.length; i++) {
		const xi = x[i];
		if (xi === 0) continue;
		for (let j = 0; j < y.length; j++) out[i + j] += xi * y[j];
	}
	// Sums of non-negative products: relative error at most (terms)·u per entry, mass ≤ 1.
	return { values: out, l1Error: 2 * Math.min(x.length, y.length) * UNIT_ROUNDOFF };
}

/** In-place iterative radix-2 FFT (sign −1 forward, +1 inverse, unscaled). */
function fft(re: Float64Array, im: Float64Array, sign: number): void {
	const n = re.length;
	for (let i = 1, j = 0; i < n; i++) {
		let bit = n >> 1;
		for (; j & bit; bit >>= 1) j ^= bit;
		j ^= bit;
		if (i < j) {
			const r = re[i];
			re[i] = re[j];
			re[j] = r;
			const m = im[i];
			im[i] = im[j];
			im[j] = m;
		}
	}
	for (let len = 2; len <= n; len <<= 1) {
		const half = len >> 1;
		const step = (sign * 2 * Math.PI) / len;
		for (let k = 0; k < half; k++) {
			const wr = Math.cos(step * k);
			const wi = Math.sin(step * k);
			for (let s = k; s < n; s += len) {
				const t = s + half;
				const xr = re[t] * wr - im[t] * wi;
				const xi = re[t] * wi + im[t] * wr;
				re[t] = re[s] - xr;
				im[t] = im[s] - xi;
				re[s] += xr;
				im[s] += xi;
			}
		}
	}
}

function viaFft(x: Float64Array, y: Float64Array): Convolution {
	const length = x.length + y.length - 1;
	let n = 1;
	while (n < length) n <<= 1;
	// x in the real part, y in the imaginary part: one forward transform serves both.
	const re = new Float64Array(n);
	const im = new Float64Array(n);
	re.set(x);
	im.set(y);
	fft(re, im, -1);
	const pr = new Float64Array(n);
	const pi = new Float64Array(n);
	for (let k = 0; k < n; k++) {
		const m = (n - k) & (n - 1);
		const xr = (re[k] + re[m]) / 2;
		const xi = (im[k] - im[m]) / 2;
		const yr = (im[k] + im[m]) / 2;
		const yi = (re[m] - re[k]) / 2;
		pr[k] = xr * yr - xi * yi;
		pi[k] = xr * yi + xi * yr;
	}
	fft(pr, pi, 1);
	const values = new Float64Array(length);
	for (let i = 0; i < length; i++) values[i] = Math.max(0, pr[i] / n);
	const log2n = Math.log2(n);
	return { values, l1Error: 10 * 20 * UNIT_ROUNDOFF * (log2n + 1) * Math.sqrt(n) };
}

export function convolve(x: Float64Array, y: Float64Array): Convolution {
	return x.length * y.length <= DIRECT_LIMIT ? direct(x, y) : viaFft(x, y);
}
