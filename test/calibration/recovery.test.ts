/**
 * The calibration recovers a simulated scanner whose truth the test knows: grey map within 1.5 dB
 * over grey 30–220, depth response within 1.5 dB, slider travel within 1.5 dB, penetration within
 * 1 cm — also after mild smoothing and with a non-logarithmic grey map, where the speckle-SD rule
 * fails (shared reference §2, cases C36/C37).
 */
import {describe, expect, it} from 'vitest';
import {calibrateScanner, type CalibrationInput} from '../../src/calibration/scanner-calibration.js';
import {makeSeries, testPhantom, testProbe, type Series} from '../helpers/phantom-speckle.js';

function inputOf(s: Series): CalibrationInput {
	return {
		label: 'test series',
		probe: testProbe,
		displayDepthCm: s.depthCm,
		phantom: testPhantom,
		columns: [0.3, 0.7],
		sliderCount: 8,
		gainSteps: s.gainSteps.map((g, i) => ({
			name: `g${i}`,
			field: `gainSteps.${i}`,
			image: g.image,
			masterGainDb: g.masterGainDb,
		})),
		probeInAir: {name: 'air', field: 'probeInAir', image: s.probeInAir.image, masterGainDb: s.probeInAir.masterGainDb},
		sliderSteps: [
			{
				name: 's',
				field: 'sliderSteps.0',
				image: s.sliderStep.image,
				masterGainDb: s.sliderStep.masterGainDb,
				slider: s.sliderStep.slider,
				position: 1,
			},
		],
	};
}

/** Largest |a − b − c| after removing the best constant c (both scales have an arbitrary zero). */
function worstAfterOffset(pairs: Array<[number, number]>): number {
	const c = pairs.reduce((s, [a, b]) => s + a - b, 0) / pairs.length;
	return Math.max(...pairs.map(([a, b]) => Math.abs(a - b - c)));
}

const cases = [
	{name: 'log grey map', gamma: 1, smoothPx: 0},
	{name: 'mild smoothing after compression', gamma: 1, smoothPx: 1},
	{name: 'non-logarithmic grey map (γ 0.7) with smoothing', gamma: 0.7, smoothPx: 1},
];

describe.each(cases)('recovery with a $name', ({gamma, smoothPx}) => {
	it.each([11, 29, 47])('seed %i: grey map, depth response, slider travel and penetration within tolerance', (seed) => {
		const s = makeSeries({seed, gamma, smoothPx});
		const cal = calibrateScanner(inputOf(s));
		const grey = cal.greyMap.filter((p) => p.grey >= 30 && p.grey <= 220);
		expect(grey[grey.length - 1]!.grey - grey[0]!.grey).toBeGreaterThanOrEqual(150);
		const greyErr = worstAfterOffset(grey.map((p) => [p.levelDb, s.truth.levelAtMeanGrey(p.grey)]));
		const depthErr = worstAfterOffset(cal.depthResponse.map((p) => [p.gainDb, s.truth.depthResponse(p.depthCm)]));
		const travelErr = Math.abs(cal.sliderTravelDb! - s.truth.sliderTravelDb);
		const penErr = Math.abs(cal.penetrationCm! - s.truth.penetrationCm);
		console.log(
			`γ ${gamma} smooth ${smoothPx} seed ${seed}: grey ${greyErr.toFixed(2)} dB over ` +
				`${grey[0]!.grey}–${grey[grey.length - 1]!.grey}, depth ${depthErr.toFixed(2)} dB to ` +
				`${cal.depthResponse[cal.depthResponse.length - 1]!.depthCm} cm, travel ` +
				`${cal.sliderTravelDb!.toFixed(2)} (true ${s.truth.sliderTravelDb}), penetration ` +
				`${cal.penetrationCm!.toFixed(2)} (true ${s.truth.penetrationCm.toFixed(2)}) cm, budget ` +
				`${cal.noiseBudgetDb!.toFixed(1)} dB, cells ` +
				`${Math.min(...cal.bands.map((b) => b.cells)).toFixed(0)}`,
		);
		expect(greyErr).toBeLessThanOrEqual(1.5);
		expect(depthErr).toBeLessThanOrEqual(1.5);
		expect(travelErr).toBeLessThanOrEqual(1.5);
		expect(penErr).toBeLessThanOrEqual(1);
		// The depth response starts within 1 cm of the skin and reaches at least the 6 dB echo-to-noise depth.
		expect(cal.depthResponse[0]!.depthCm).toBeLessThanOrEqual(1);
		const enr6 = cal.bands.find((b) => b.echoToNoiseDb !== null && b.echoToNoiseDb < 6);
		expect(cal.depthResponse[cal.depthResponse.length - 1]!.depthCm).toBeGreaterThanOrEqual(enr6!.depthCm - 0.5);
	});
});
