import {describe, expect, it} from 'vitest';
import {fitSliders, type FitMemory, type FitRequest} from '../../src/engine/slider-fit.js';
import type {SliderBank} from '../../src/engine/types.js';

// A table fits a run of similar curves (one habitus at rising frequencies) and starts each fit's
// minimax programme from the one before (fitSliders' `memory`). Its optimum is unique in value and the
// tie-break picks a unique point, so the fits must come out as they do from scratch; the reference is
// the fit without memory, which the other slider-fit tests hold to worked examples.

const bank: SliderBank = {count: 8, minDb: -15, maxDb: 15, knots: 'band-centres', ends: 'flat', rampDbPerCmMhz: 0};
const depthsCm = Array.from({length: 161}, (_, i) => Math.round(i * 0.1 * 1e9) / 1e9);

/** A curve like one frequency of a sweep: the loss grows with frequency, and the noise floor rises. */
function request(mhz: number): FitRequest {
	const alpha = 0.5 * mhz;
	const targetDb = depthsCm.map((z) => 2 * alpha * z + 4 * Math.sin(z) + (z > 2 ? 3 : 0));
	const usableDepthCm = Math.min(16, 60 / alpha);
	return {depthsCm, targetDb, usableDepthCm, bank, displayDepthCm: 16, master: {minDb: 0, maxDb: 90}};
}

describe('a fit started from the fit before it', () => {
	it('gives the fits a fresh start gives, along a run of rising frequencies and back down', () => {
		const memory: FitMemory = {};
		const run = [2, 2.2, 2.4, 2.6, 3, 3.4, 4, 5, 6.5, 8, 6, 4.2, 2.1];
		for (const mhz of run) {
			const fresh = fitSliders(request(mhz));
			const started = fitSliders(request(mhz), memory);
			expect(started.residualDb).toBeCloseTo(fresh.residualDb, 9);
			expect(started.residualAtCm).toBe(fresh.residualAtCm);
			expect(started.masterGainDb).toBeCloseTo(fresh.masterGainDb, 9);
			started.sliders.forEach((s, k) => {
				expect(s.depthCm).toBe(fresh.sliders[k]!.depthCm);
				expect(s.gainDb).toBeCloseTo(fresh.sliders[k]!.gainDb, 9);
			});
		}
		expect(memory.last).toBeDefined();
	});

	it('starts afresh when the bank changed since', () => {
		const memory: FitMemory = {};
		fitSliders(request(3), memory);
		const other = {...request(3), bank: {...bank, count: 6}};
		const started = fitSliders(other, memory);
		const fresh = fitSliders(other);
		expect(started.residualDb).toBeCloseTo(fresh.residualDb, 9);
		expect(started.sliders).toHaveLength(6);
	});
});
