/** The few jStat functions the tests use as a general-purpose reference. */
declare module 'jstat' {
	const jStat: {
		normal: { inv(p: number, mean: number, sd: number): number; cdf(x: number, mean: number, sd: number): number };
		median(xs: number[]): number;
		quantiles(xs: number[], qs: number[], alphap?: number, betap?: number): number[];
	};
	export default jStat;
}
