import {readFileSync} from 'node:fs';
import {describe, expect, it} from 'vitest';
import {fitSliders, type FitRequest} from '../../src/engine/slider-fit.js';

/**
 * Four fit requests, captured from generated bench plans, whose optimal totals use the whole slider
 * range: the tie-break's 1e-9 slack and rounding left the master's feasible interval empty by about
 * 1e-13 dB, and the split then clipped sliders hard (worst error 13.7/19.8/11.6/15.9 dB instead of the
 * optimum). `boundDb` is the minimax optimum found independently with a dense tableau simplex under
 * Bland's rule (Bland 1977, Math. Oper. Res. 2:103–107; Chvátal 1983, Linear Programming — from
 * memory), used as a weak-duality certificate: no realisable setting does better.
 */
interface Case {
	readonly name: string;
	readonly boundDb: number;
	readonly request: FitRequest;
}
const cases = JSON.parse(
	readFileSync(new URL('../fixtures/fit/split-edge-requests.json', import.meta.url), 'utf8'),
) as Case[];

describe('master/slider split at the edge of the slider range', () => {
	it('has the four captured cases', () =>
		expect(cases.map((c) => c.name).sort()).toEqual(['varied 10', 'varied 5', 'varied 57', 'varied 8']));
	for (const c of cases) {
		it(`${c.name}: the fit reaches the independent optimum ${c.boundDb.toFixed(3)} dB and stays realisable`, () => {
			const fit = fitSliders(c.request);
			expect(fit.residualDb).toBeLessThanOrEqual(c.boundDb + 1e-6 * (1 + c.boundDb));
			const {bank, master} = c.request;
			expect(fit.masterGainDb).toBeGreaterThanOrEqual(master.minDb - 1e-9);
			expect(fit.masterGainDb).toBeLessThanOrEqual(master.maxDb + 1e-9);
			for (const s of fit.sliders) {
				expect(s.gainDb).toBeGreaterThanOrEqual(bank.minDb - 1e-6);
				expect(s.gainDb).toBeLessThanOrEqual(bank.maxDb + 1e-6);
			}
		});
	}
});
