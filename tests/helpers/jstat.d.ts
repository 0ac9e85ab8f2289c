/** The one function the tests use from jstat (it ships no types). */
declare module 'jstat' {
	const jStat: { median(values: number[]): number };
	export default jStat;
}
