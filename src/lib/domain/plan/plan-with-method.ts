/**
 * This week's build suggestion, forecast by whichever smoothing follows the model's history
 * better (method-choice.ts): the same demand, stock and equivalent-WIP arithmetic as
 * build-plan.ts, with the chosen method's forecast and how far to trust it.
 */
import { planModel, type PlanInput, type PlanResult } from './build-plan';
import { chooseMethod, type MethodChoice } from './method-choice';

const EPS = 1e-9;

export interface MethodPlanResult extends PlanResult {
	choice: MethodChoice;
}

export function planModelWithMethod(input: PlanInput): MethodPlanResult {
	const base = planModel(input);
	const choice = chooseMethod(input.history, input.alpha);
	const forecast = input.history.length ? choice.forecast : 0;
	const demand = Math.max(forecast, input.openDue);
	const suggested = Math.max(0, Math.ceil(demand - base.available - EPS));
	return { ...base, forecast, demand, suggested, choice };
}
