/**
 * Little's law (Little 1961, Operations Research 9(3):383–387): in a stable system the average
 * number of items inside equals the arrival (= departure) rate times the average time inside,
 * L = λ·W. Used as a consistency check beside the flow figures.
 */
import { nonNegative, result } from '../numbers';

export function littlesLawWip(throughputPerTime: number, cycleTime: number): number {
	nonNegative('Throughput', throughputPerTime);
	nonNegative('Time in the system', cycleTime);
	return result('Work in progress (λ·W)', throughputPerTime * cycleTime);
}

export interface LittleCheck {
	/** WIP measured directly (time-averaged over the period). */
	measured: number;
	/** λ·W from throughput and cycle time. */
	predicted: number;
	/** measured / predicted − 1, or null when predicted is 0. */
	relativeGap: number | null;
	/** Within the tolerance (default ±20 %). */
	agrees: boolean;
}

export function littleCheck(measuredWip: number, throughputPerTime: number, cycleTime: number, tolerance = 0.2): LittleCheck {
	nonNegative('Measured work in progress', measuredWip);
	nonNegative('The tolerance', tolerance);
	const predicted = littlesLawWip(throughputPerTime, cycleTime);
	if (predicted === 0) return { measured: measuredWip, predicted, relativeGap: null, agrees: measuredWip === 0 };
	const gap = result('The gap between measured and predicted work in progress', measuredWip / predicted - 1);
	return { measured: measuredWip, predicted, relativeGap: gap, agrees: Math.abs(gap) <= tolerance };
}
