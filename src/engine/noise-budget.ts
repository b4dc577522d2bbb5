/**
 * The system's noise budget: the largest round-trip loss it can still lift above its noise floor.
 *
 * Calibrated from a phantom measurement (IEC 61391-2 describes how the maximum depth of penetration
 * is measured): if this probe reaches D cm in a uniform phantom of slope β, the budget is the loss of
 * the reference echo at D in that phantom, worked out with the same spectrum model. For linear-in-f
 * tissue a patient then reaches the depth where Σβᵢ·dᵢ = β·D, whatever the bandwidth (derived: the
 * broadband loss depends on the layers only through Σβᵢ·dᵢ). It assumes the patient's backscatter matches the phantom's and the
 * scanner settings are the same.
 */
import {PathModel} from './path-model.js';
import type {EnginePlan, ReceiveMode} from './types.js';

export interface PhantomCalibration {
	/** Probe centre frequency used in the phantom, MHz. */
	readonly centerMhz: number;
	/** Depth of penetration read in the phantom, cm (phantom speed 1540 m/s, so true = displayed). */
	readonly depthCm: number;
	/** Phantom attenuation slope, dB/cm/MHz, linear in f. */
	readonly alphaDbPerCmMhz: number;
	/** Receive mode the reach was measured in; absent = fundamental. The budget is worked out in
	 * that mode: a reach measured in fundamental does not give the harmonic budget. */
	readonly receive?: ReceiveMode;
}

export function noiseBudgetFromPhantom(
	cal: PhantomCalibration,
	probe: Pick<EnginePlan['probe'], 'bandwidthFraction' | 'spectrumSteepness'>,
	scattererExponent: number,
): number {
	const l = lastBudget;
	if (
		l !== null &&
		l.centerMhz === cal.centerMhz &&
		l.depthCm === cal.depthCm &&
		l.alphaDbPerCmMhz === cal.alphaDbPerCmMhz &&
		l.receive === cal.receive &&
		l.bandwidthFraction === probe.bandwidthFraction &&
		l.spectrumSteepness === probe.spectrumSteepness &&
		l.scattererExponent === scattererExponent
	)
		return l.budgetDb;
	const budgetDb = phantomLoss(cal, probe, scattererExponent);
	lastBudget = {
		centerMhz: cal.centerMhz,
		depthCm: cal.depthCm,
		alphaDbPerCmMhz: cal.alphaDbPerCmMhz,
		receive: cal.receive,
		bandwidthFraction: probe.bandwidthFraction,
		spectrumSteepness: probe.spectrumSteepness,
		scattererExponent,
		budgetDb,
	};
	return budgetDb;
}

/**
 * The last budget worked out and everything it depends on. Every row of a protocol table resolves
 * its plan anew and asks again for the same phantom and probe (the probe's centre frequency is not
 * among them): a loss model and a band integral per row, some 3 % of a table. Pure all the same:
 * the same inputs give the same number whether kept or not.
 */
let lastBudget: {
	readonly centerMhz: number;
	readonly depthCm: number;
	readonly alphaDbPerCmMhz: number;
	readonly receive: ReceiveMode | undefined;
	readonly bandwidthFraction: number;
	readonly spectrumSteepness: number | undefined;
	readonly scattererExponent: number;
	readonly budgetDb: number;
} | null = null;

function phantomLoss(
	cal: PhantomCalibration,
	probe: Pick<EnginePlan['probe'], 'bandwidthFraction' | 'spectrumSteepness'>,
	scattererExponent: number,
): number {
	const phantom = {
		label: 'calibration phantom',
		speedMps: 1540,
		densityKgM3: 1050,
		alphaDbPerCmMhz: cal.alphaDbPerCmMhz,
		exponent: 1,
	};
	const model = new PathModel(
		[{tissue: phantom, thicknessCm: cal.depthCm}],
		{
			bandwidthFraction: probe.bandwidthFraction,
			spectrumSteepness: probe.spectrumSteepness,
			centerMhz: cal.centerMhz,
			receive: cal.receive ?? 'fundamental',
		},
		scattererExponent,
		1540,
	);
	return model.lossAt(cal.depthCm);
}
