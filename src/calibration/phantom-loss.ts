/**
 * The engine's broadband round-trip loss in a uniform phantom (scatterer exponent 0), used both to
 * turn measured band levels into the scanner's depth response (R = E + L_ph) and to turn a measured
 * penetration depth into the engine's noise budget.
 */
import {PathModel} from '../engine/path-model.js';

export interface ProbeSpectrum {
	readonly centerMhz: number;
	readonly bandwidthFraction: number;
}

export interface PhantomMaterial {
	readonly alphaDbPerCmMhz: number;
	readonly exponent: number;
	readonly speedMps: number;
}

/** Scanners draw depth at 1540 m/s (common practice, no source). */
const assumedSpeedMps = 1540;

const cache = new Map<string, PathModel>();

function modelFor(phantom: PhantomMaterial, probe: ProbeSpectrum): PathModel {
	const key = JSON.stringify([phantom, probe.centerMhz, probe.bandwidthFraction]);
	let model = cache.get(key);
	if (!model) {
		const tissue = {
			label: 'calibration phantom',
			speedMps: phantom.speedMps,
			densityKgM3: 1050,
			alphaDbPerCmMhz: phantom.alphaDbPerCmMhz,
			exponent: phantom.exponent,
		};
		model = new PathModel(
			[{tissue, thicknessCm: 100}],
			{centerMhz: probe.centerMhz, bandwidthFraction: probe.bandwidthFraction, receive: 'fundamental'},
			0,
			assumedSpeedMps,
		);
		if (cache.size > 16) cache.clear();
		cache.set(key, model);
	}
	return model;
}

/** Round-trip loss of the phantom's echo at a displayed depth, dB. */
export function phantomLossDb(phantom: PhantomMaterial, probe: ProbeSpectrum, displayedCm: number): number {
	return modelFor(phantom, probe).lossAt(displayedCm);
}
