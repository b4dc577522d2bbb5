/**
 * Refinement on simulated patient frames whose truth is known: an invented standard adult upper
 * abdomen (skin, fat, muscle, liver) whose liver attenuates between 0.35 and 0.9 dB/cm/MHz instead
 * of the library's 0.5 (a fatty liver reads 0.7–0.9), some frames with a cyst-like anechoic disc and
 * a bright specular line across the measured columns.
 */
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {settingsOfFit} from '../../src/analysis/applied-gain.js';
import {withLayerAlpha} from '../../src/analysis/attenuation-fit.js';
import {refineImage, type RefineResult} from '../../src/analysis/refine-image.js';
import {maskCodes} from '../../src/analysis/speckle-mask.js';
import {speckleFrame} from '../helpers/speckle-frame.js';
import {liverLayer, scenarioCase, scenarioFrame, scenarioPlan} from '../helpers/refine-scenario.js';

const plan = scenarioPlan();

function flatness(r: RefineResult): number {
	const usable = r.bands.filter((b) => b.usable);
	const mean = usable.reduce((s, b) => s + b.correctedDb, 0) / usable.length;
	return Math.max(...usable.map((b) => Math.abs(b.correctedDb - mean)));
}

function refined(k: number): RefineResult {
	const {frame, region} = scenarioFrame(plan, k);
	const out = refineImage({frame, region, plan});
	if (!out.ok) throw new Error(out.problem);
	return out;
}

describe('40 simulated patients', () => {
	const results = Array.from({length: 40}, (_, k) => ({k, truth: scenarioCase(k).alpha, out: refined(k)}));

	it('every frame gives an attenuation for the liver', () => {
		for (const r of results) expect(r.out.attenuation, `case ${r.k}: ${r.out.cannotTell}`).not.toBeNull();
	});

	it('the 95 % interval holds the true α0 in at least 38 of 40 frames (95 %)', () => {
		const inside = results.filter(
			(r) => r.out.attenuation && r.truth >= r.out.attenuation.low && r.truth <= r.out.attenuation.high,
		);
		expect(inside.length).toBeGreaterThanOrEqual(38);
	});

	it('every estimate is within 0.08 dB/cm/MHz of the truth', () => {
		for (const r of results)
			expect(Math.abs(r.out.attenuation!.alphaDbPerCmMhz - r.truth), `case ${r.k}`).toBeLessThan(0.08);
	});

	it('after the corrections the tissue level is flat within 1.5 dB over the usable depth', () => {
		for (const r of results) expect(flatness(r.out), `case ${r.k}`).toBeLessThan(1.5);
	});

	it('every cyst and bright line is masked, not averaged in', () => {
		for (const r of results) {
			const c = scenarioCase(r.k);
			if (c.cyst) expect(r.out.mask.maskedPx.anechoic, `case ${r.k}`).toBeGreaterThan(0);
			if (c.line) expect(r.out.mask.maskedPx.bright, `case ${r.k}`).toBeGreaterThan(0);
		}
	});

	it('says on every result that it is uncalibrated and what the assumptions can cost', () => {
		for (const r of results) {
			const w = r.out.warnings.find((x) => x.code === 'uncalibrated');
			expect(w?.message).toMatch(/Uncalibrated/);
			expect(w?.message).toMatch(/dB\/cm\/MHz if the true range were 50–70 dB/);
			expect(r.out.uncalibrated?.alphaAtRamp).not.toBeNull();
		}
	});
});

describe('round trip: the plan itself', () => {
	const applied = settingsOfFit(computeCurve(plan).fit);
	const runs = [0, 1, 2, 3].map((k) => {
		const {frame, region} = speckleFrame({
			plan,
			truth: plan,
			applied,
			seed: 900 + k,
			cyst: k % 2 ? {depthCm: 8, x: 0.5, radiusCm: 0.8} : undefined,
		});
		const out = refineImage({frame, region, plan});
		if (!out.ok) throw new Error(out.problem);
		return out;
	});

	it("the plan's own α0 lies in the interval and the corrections stay within what the interval allows", () => {
		for (const out of runs) {
			const a = out.attenuation!;
			expect(a.low).toBeLessThanOrEqual(0.5);
			expect(a.high).toBeGreaterThanOrEqual(0.5);
			// The largest slider change either end of the interval would call for.
			const ends = [a.low, a.high].map((x) => settingsOfFit(computeCurve(withLayerAlpha(plan, liverLayer, x)).fit));
			const bound = (k: number) => Math.max(...ends.map((e) => Math.abs(e.slidersDb[k]! - applied.slidersDb[k]!)));
			out.sliders.forEach((s, k) => expect(Math.abs(s.correctionDb)).toBeLessThanOrEqual(bound(k) + 0.05));
			expect(Math.abs(out.masterCorrectionDb)).toBeLessThanOrEqual(
				Math.max(...ends.map((e) => Math.abs(e.masterGainDb - applied.masterGainDb))) + 0.05,
			);
		}
	});

	it('residuals stay within the speckle bounds: every usable band within its 95 % half-width of the offset, give or take', () => {
		for (const out of runs) {
			const usable = out.bands.filter((b) => b.usable);
			const outside = usable.filter((b) => Math.abs(b.residualDb - out.offsetDb) > b.halfWidthDb + 0.6);
			expect(outside.length).toBeLessThanOrEqual(1);
		}
	});
});

describe('stated settings', () => {
	it("an image taken with other settings: corrections bring them to the plan's own fit", () => {
		const fit = settingsOfFit(computeCurve(plan).fit);
		const applied = {slidersDb: fit.slidersDb.map((s, k) => s + (k === 5 ? 4 : 0)), masterGainDb: fit.masterGainDb - 3};
		const {frame, region} = speckleFrame({plan, truth: plan, applied, seed: 77});
		const out = refineImage({frame, region, plan, applied});
		if (!out.ok) throw new Error(out.problem);
		const a = out.attenuation!;
		expect(Math.abs(a.alphaDbPerCmMhz - 0.5)).toBeLessThan(0.04);
		expect(
			out.masterCorrectionDb + out.sliders[5]!.correctionDb - (out.sliders[0]!.correctionDb + out.masterCorrectionDb),
		).toBeLessThan(-2);
		expect(out.warnings.find((w) => w.code === 'settings-stated')?.message).toMatch(/stated settings/);
	});
});

describe('what the image cannot tell, and bad input', () => {
	it('a thin layer is declined with the reason', () => {
		const {frame, region} = scenarioFrame(plan, 2);
		const out = refineImage({frame, region, plan, layerIndex: 2});
		if (!out.ok) throw new Error(out.problem);
		expect(out.attenuation).toBeNull();
		expect(out.cannotTell).toMatch(/layer 3 .* usable band/);
		expect(out.warnings.some((w) => w.code === 'cannot-tell')).toBe(true);
		// The sliders are then the plan's own fit.
		const own = settingsOfFit(computeCurve(plan).fit);
		out.sliders.forEach((s, k) => expect(s.gainDb).toBeCloseTo(own.slidersDb[k]!, 6));
	});

	it('a layer below the usable image is too shallow to tell', () => {
		const deep = scenarioPlan({
			layers: [
				{tissue: 'fat', thicknessCm: 2},
				{tissue: 'liver', thicknessCm: 5},
				{tissue: 'kidney', thicknessCm: 10},
			],
			noiseBudgetDb: 30,
		});
		const applied = settingsOfFit(computeCurve(deep).fit);
		const {frame, region} = speckleFrame({plan: deep, truth: deep, applied, seed: 5});
		const out = refineImage({frame, region, plan: deep});
		if (!out.ok) throw new Error(out.problem);
		expect(out.attenuation).toBeNull();
		expect(out.cannotTell).toMatch(/layer 3/);
	});

	it('an all-anechoic image (noise only) is refused as having no tissue', () => {
		const applied = settingsOfFit(computeCurve(plan).fit);
		const {frame, region} = speckleFrame({plan, truth: plan, applied, seed: 3, anechoic: true});
		const out = refineImage({frame, region, plan});
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.problem).toMatch(/no tissue/);
	});

	it('an all-anechoic image with the noise lifted into view is refused too', () => {
		const applied = settingsOfFit(computeCurve(plan).fit);
		const {frame, region} = speckleFrame({plan, truth: plan, applied, seed: 3, anechoic: true, topDb: -20});
		const out = refineImage({frame, region, plan});
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.problem).toMatch(/no tissue/);
	});

	it('a plan whose display depth differs from the image is refused, naming both depths', () => {
		const {frame, region} = scenarioFrame(plan, 1);
		const other = scenarioPlan({display: {depthCm: 12, assumedSpeedMps: 1540}});
		const out = refineImage({frame, region, plan: other});
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.problem).toMatch(/16\.0 cm .* 12 cm/);
	});

	it('masks mark the cyst as anechoic pixels inside the measured columns', () => {
		const {frame, region} = scenarioFrame(plan, 1);
		const out = refineImage({frame, region, plan});
		if (!out.ok) throw new Error(out.problem);
		const c = scenarioCase(1);
		expect(c.cyst).toBe(true);
		// Centre of the disc (case 1: 7 cm deep, at 0.47 of the width).
		const row = Math.round(7 / region.cmPerPixel);
		const col = Math.round(0.47 * frame.width);
		expect(out.mask.codes[row * frame.width + col]).toBe(maskCodes.anechoic);
	});
});
