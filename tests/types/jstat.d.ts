// Minimal types for the parts of jstat the tests use as an independent reference.
declare module 'jstat' {
	export const jStat: {
		poisson: { pdf(k: number, lambda: number): number; cdf(k: number, lambda: number): number };
		gamma: { cdf(x: number, shape: number, scale: number): number };
		beta: {
			cdf(x: number, a: number, b: number): number;
			inv(p: number, a: number, b: number): number;
		};
		chisquare: { cdf(x: number, dof: number): number };
		normal: { inv(p: number, mean: number, sd: number): number };
		combination(n: number, k: number): number;
		factorial(n: number): number;
	};
}
