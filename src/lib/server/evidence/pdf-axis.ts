/** Round tick values for the ladder's numeric axis (1, 2 or 5 times a power of ten apart). */

/** A step of 1, 2 or 5 × 10^n near `span / target`. */
export function niceStep(span: number, target = 5): number {
	if (!(span > 0) || !Number.isFinite(span)) return 1;
	const raw = span / target;
	const power = 10 ** Math.floor(Math.log10(raw));
	const scaled = raw / power;
	const factor = scaled < 1.5 ? 1 : scaled < 3.5 ? 2 : scaled < 7.5 ? 5 : 10;
	return factor * power;
}

/** Ticks at multiples of the step inside [lo, hi], rounded to the step's decimals. */
export function ticks(lo: number, hi: number, target = 5): number[] {
	const step = niceStep(hi - lo, target);
	const decimals = Math.max(0, -Math.floor(Math.log10(step)));
	const out: number[] = [];
	for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step)
		out.push(Number(v.toFixed(decimals)));
	return out;
}
