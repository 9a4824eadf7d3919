import type { FourierConvention } from '../bases';
import type { CountTable } from '../counts';
import type { PoissonModel } from '../model';

export type MethodId = 'mub-correlation' | 'steering-2mub' | 'fidelity-two-basis';

export type Trust = 'device-dependent' | 'one-sided device-independent';

/** One published witness family (witnesses.md §4). */
export interface WitnessFamily {
	id: MethodId;
	title: string;
	trust: Trust;
	/** The published source of the statistic and its bounds. */
	reference: string;
	/** The statistic's letter on every page, chart and report: S, W or F̃. */
	symbol: string;
	/** The statistic in a physicist's words, e.g. "correlation sum over m mutually unbiased bases". */
	statisticName: string;
	/** Its largest possible value for the bases used (a perfectly correlated state reaches it). */
	maximum(bases: number[]): number;
	/** Which side's measurements are trusted, as the command line says it. */
	trustedSides: string;
	/** The statistic and its ladder as one line of plain formulas. */
	formula: string;
	/** What the trust assumption means in practice, in one sentence. */
	trustNote: string;
	/** What the method assumes beyond independent, fairly sampled pairs (the method's page). */
	assumes?: string[];
	/** When to choose this method over the others, for the method's page. */
	preferWhen?: string;
	/** Which bases the method accepts, in a few words for forms. */
	basesNote: string;
	/** Which bases to use when none are requested, from those present in the file. */
	defaultBases(present: number[], d: number): number[];
	/** Throws a RangeError naming the problem when the bases do not suit the method. */
	checkBases(bases: number[], d: number, fourier?: FourierConvention): void;
	/** B_1 < … < B_{d−1}: a state of Schmidt number ≤ r cannot exceed B_r. */
	bounds(d: number, bases: number[]): number[];
	/** The statistic from probability tables p_t(a, b), one per basis in `bases` order. */
	statistic(p: Float64Array[], d: number, bases: number[], fourier?: FourierConvention): number;
	/** The same statistic over sufficient Poisson totals of raw count tables (§6). */
	sufficientModel(
		tables: CountTable[],
		d: number,
		bases: number[],
		fourier?: FourierConvention
	): PoissonModel;
	/** What the result may additionally say (e.g. the steering robustness). */
	extras?(value: number, lower: number, d: number): Record<string, number>;
}
