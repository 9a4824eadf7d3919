// Minimal types for the parts of jstat the tests use as an independent reference.
declare module 'jstat' {
	export const jStat: {
		poisson: { pdf(k: number, lambda: number): number; cdf(k: number, lambda: number): number };
		chisquare: { cdf(x: number, dof: number): number };
		normal: { inv(p: number, mean: number, sd: number): number };
	};
}
