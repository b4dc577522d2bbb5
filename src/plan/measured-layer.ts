/**
 * A plan with one layer's attenuation measured on the patient's image: α0 and its 95 % interval
 * (the spread the plan then carries for that layer). Shared by `refine --write-plan` and the
 * console's "refine from an image".
 */
import {planFormat, type PlanDocument} from './plan-schema.js';

export interface MeasuredAttenuation {
	/** 0-based layer index. */
	readonly layerIndex: number;
	readonly alphaDbPerCmMhz: number;
	readonly low: number;
	readonly high: number;
}

const round = (x: number) => Math.round(x * 1000) / 1000;

export function planWithMeasuredLayer(doc: PlanDocument, a: MeasuredAttenuation): PlanDocument {
	const alpha = round(a.alphaDbPerCmMhz);
	const measuredAlpha = {
		alphaDbPerCmMhz: alpha,
		lowDbPerCmMhz: Math.min(alpha, round(a.low)),
		highDbPerCmMhz: Math.max(alpha, round(a.high)),
	};
	return {
		...doc,
		format: planFormat,
		layers: doc.layers.map((l, i) => (i === a.layerIndex ? {...l, measuredAlpha} : l)),
	};
}
