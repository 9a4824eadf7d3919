/**
 * Are the settings plausibly random with the declared probabilities? The certificate's one
 * assumption cannot be proved from data, but a predictable order (alternating, long runs, skewed
 * frequencies) can be caught: a frequency chi-square and a runs test, each at SETTINGS_LEVEL.
 */

/** Each test's level; a sequence that is truly random is flagged with probability ≤ 2 × this. */
export const SETTINGS_LEVEL = 0.001;
/** Fewer settings than this per basis (expected) and the chi-square approximation is not used. */
const MIN_EXPECTED = 5;

/** Regularised upper incomplete gamma Q(a, x): series below a + 1, Lentz continued fraction above. */
export function upperGamma(a: number, x: number): number {
	if (x <= 0) return 1;
	const logPrefix = a * Math.log(x) - x - logGamma(a);
	if (x < a + 1) {
		let term = 1 / a;
		let sum = term;
		for (let n = 1; n < 1000 && Math.abs(term) > Math.abs(sum) * 1e-16; n++) {
			term *= x / (a + n);
			sum += term;
		}
		return Math.max(0, 1 - sum * Math.exp(logPrefix));
	}
	let b = x + 1 - a;
	let c = 1e300;
	let d = 1 / b;
	let h = d;
	for (let i = 1; i < 1000; i++) {
		const an = -i * (i - a);
		b += 2;
		d = an * d + b;
		d = Math.abs(d) < 1e-300 ? 1e-300 : d;
		c = b + an / c;
		c = Math.abs(c) < 1e-300 ? 1e-300 : c;
		d = 1 / d;
		const delta = d * c;
		h *= delta;
		if (Math.abs(delta - 1) < 1e-16) break;
	}
	return Math.exp(logPrefix) * h;
}

/** ln Γ(a) by the Lanczos approximation (g = 7, nine coefficients; common practice). */
function logGamma(a: number): number {
	const g = [
		0.9999999999998099, 676.5203681218851, -1259.1392167224028, 771.3234287776531,
		-176.6150291621406, 12.507343278686905, -0.13857109526572012, 9.984369578019572e-6,
		1.5056327351493116e-7
	];
	if (a < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * a)) - logGamma(1 - a);
	const z = a - 1;
	let x = g[0];
	for (let i = 1; i < 9; i++) x += g[i] / (z + i);
	const t = z + 7.5;
	return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(x);
}

const tail = (p: number) => (p > 0 ? p.toExponential(2) : '< 1e-300');

export interface SettingsCheck {
	level: number;
	/** Frequency test: Pearson's chi-square of the setting counts against n·π, m − 1 degrees. */
	chiSquare: number;
	degrees: number;
	frequencyP: number | null;
	/** Runs test: changes of setting between neighbours, against (n − 1)(1 − Σπ²), two-sided. */
	changes: number;
	expectedChanges: number;
	runsZ: number;
	runsP: number | null;
	passed: boolean;
	/** Why the check failed or could not be made; null when it passed. */
	message: string | null;
}

/**
 * `settings`: basis per trial (or block); `bases` with probabilities `pi`. Under i.i.d. settings
 * the change indicators are 1-dependent: Var = (n−1)q(1−q) + 2(n−2)(Σπ(1−π)² − q²), q = 1 − Σπ².
 */
export function checkSettings(settings: Uint16Array, bases: number[], pi: number[]): SettingsCheck {
	const n = settings.length;
	// Slot of each basis by its number: a typed lookup per setting, not a Map's.
	const index = new Int32Array(Math.max(...bases) + 1);
	bases.forEach((b, k) => (index[b] = k));
	const counts = new Float64Array(bases.length);
	let changes = 0;
	for (let i = 0; i < n; i++) {
		counts[index[settings[i]]]++;
	}
	// Branch-free: settings change at random, so a branch would mispredict half the time.
	for (let i = 1; i < n; i++) {
		const differ = settings[i] ^ settings[i - 1];
		changes += (differ | -differ) >>> 31;
	}
	let chiSquare = 0;
	bases.forEach((_, k) => (chiSquare += (counts[k] - n * pi[k]) ** 2 / (n * pi[k])));
	const degrees = bases.length - 1;
	const enough = Math.min(...pi) * n >= MIN_EXPECTED;
	const frequencyP = enough && degrees > 0 ? upperGamma(degrees / 2, chiSquare / 2) : null;
	const q = 1 - pi.reduce((s, p) => s + p * p, 0);
	const both = pi.reduce((s, p) => s + p * (1 - p) ** 2, 0);
	const variance = (n - 1) * q * (1 - q) + 2 * Math.max(0, n - 2) * (both - q * q);
	const expectedChanges = (n - 1) * q;
	const runsZ = variance > 0 ? (changes - expectedChanges) / Math.sqrt(variance) : 0;
	// Two-sided normal tail: 2·(1 − Φ(|z|)) = Q(1/2, z²/2).
	const runsP = enough && variance > 0 ? upperGamma(0.5, (runsZ * runsZ) / 2) : null;
	const failed: string[] = [];
	if (frequencyP !== null && frequencyP < SETTINGS_LEVEL)
		failed.push(
			`their frequencies do not match the declared probabilities (p = ${tail(frequencyP)})`
		);
	if (runsP !== null && runsP < SETTINGS_LEVEL)
		failed.push(
			`they change ${changes} times where random choices would change about ${Math.round(expectedChanges)} times (p = ${tail(runsP)})`
		);
	const message =
		failed.length > 0
			? `The settings do not look random: ${failed.join('; ')}. This certificate holds only if each setting is chosen at random, independently of the source; with predictable settings a separable source can match every time.`
			: !enough
				? `Too few settings to check their randomness (fewer than ${MIN_EXPECTED} expected per basis).`
				: null;
	return {
		level: SETTINGS_LEVEL,
		chiSquare,
		degrees,
		frequencyP,
		changes,
		expectedChanges,
		runsZ,
		runsP,
		passed: failed.length === 0,
		message
	};
}
