/**
 * The engine against published values and worked examples. Each check names its source; "derived"
 * means reproducible arithmetic from the cited formula (worked independently in Python with NumPy/SciPy,
 * Harris et al. 2020, Virtanen et al. 2020). Values marked "from memory" are unverified inputs, kept marked.
 */
import {describe, expect, it} from 'vitest';
import {computeCurve, pathModelOf} from '../../src/engine/compensation-curve.js';
import {pathDb, sigmaFromBandwidth} from '../../src/engine/echo-spectrum.js';
import {reflectionCoefficient, roundTripTransmissionLossDb} from '../../src/engine/interface-loss.js';
import {echoTimeUs, layerSpans, displayedDepthOf} from '../../src/engine/layer-geometry.js';
import {noiseBudgetFromPhantom} from '../../src/engine/noise-budget.js';
import {impedanceMrayl, libraryTissue} from '../../src/engine/tissue-library.js';
import {bandwidthForSigma, custom, matched, plan, tissue} from '../helpers/plans.js';

/** A medium given only by its impedance (MRayl), for handbook-impedance checks. */
const byZ = (z: number) => ({speedMps: 1540, densityKgM3: (z * 1e6) / 1540});

describe('interface losses from Z = ρc', () => {
	it(
		'fat/muscle reflects about 1 % (Maier et al. 2018, Medical Imaging Systems, Table 11.3); ' +
			'Z 1.38/1.70 MRayl gives R = 0.0108 and 0.094 dB round trip (derived, case C7)',
		() => {
			const r = reflectionCoefficient(byZ(1.38), byZ(1.7));
			expect(r).toBeCloseTo(0.0108, 4);
			expect(roundTripTransmissionLossDb(r)).toBeCloseTo(0.094, 3);
		},
	);

	it(
		'soft tissue/air reflects 99.9 % (Maier et al. 2018, Table 11.3); muscle 1.71 vs air ' +
			'0.0004 MRayl gives R = 0.9991 (derived, case C8)',
		() => {
			expect(reflectionCoefficient(byZ(1.71), byZ(0.0004))).toBeCloseTo(0.9991, 4);
		},
	);

	it(
		'soft tissue → cortical bone with the library impedances: R = 0.367, 3.97 dB round trip ' +
			'(tissue table worked example 4a, computed from Cardoso & Cowin 2012 Table 3 values)',
		() => {
			const r = reflectionCoefficient(tissue('soft-tissue'), tissue('cortical-bone'));
			expect(r).toBeCloseTo(0.367, 3);
			expect(roundTripTransmissionLossDb(r)).toBeCloseTo(3.97, 2);
		},
	);

	it('library fat → muscle: R = 0.01366, 0.119 dB; skin → fat: 0.02087, 0.183 dB (worked example 4a)', () => {
		const fm = reflectionCoefficient(tissue('fat'), tissue('muscle'));
		expect(fm).toBeCloseTo(0.01366, 4);
		expect(roundTripTransmissionLossDb(fm)).toBeCloseTo(0.119, 3);
		const sf = reflectionCoefficient(tissue('skin'), tissue('fat'));
		expect(sf).toBeCloseTo(0.02087, 4);
		expect(roundTripTransmissionLossDb(sf)).toBeCloseTo(0.183, 3);
	});

	it('impedances Z = ρc of the library (fat 1.312, liver 1.673, cortical bone 6.650 MRayl; tissue table §1)', () => {
		expect(impedanceMrayl(tissue('fat'))).toBeCloseTo(1.312, 3);
		expect(impedanceMrayl(tissue('liver'))).toBeCloseTo(1.673, 3);
		expect(impedanceMrayl(tissue('cortical-bone'))).toBeCloseTo(6.65, 3);
	});
});

describe('power-law attenuation conventions', () => {
	it(
		'regulatory derating 0.3 dB/cm/MHz at 3 MHz over 5 cm one way = 4.5 dB (IEC 62359 / FDA ' +
			'2019 convention via NEMA UD 2, secondary; case C1)',
		() => {
			expect(pathDb({exponents: [1], coefficients: [0.3 * 5]}, 3)).toBeCloseTo(4.5, 9);
		},
	);

	it(
		'soft-tissue rule of thumb 0.5 dB/cm/MHz one way (common practice, no source; IEC ' +
			'61391-2 phantom average, secondary): 5 MHz reflector at 6 cm loses 30 dB round trip ' +
			'(case C4)',
		() => {
			const soft = tissue('soft-tissue');
			expect(soft.alphaDbPerCmMhz).toBe(0.5);
			expect(soft.exponent).toBe(1);
			const model = pathModelOf(plan([{tissue: soft, thicknessCm: 10}], {centerMhz: 5}));
			expect(model.at(6).attenuationDb).toBeCloseTo(30, 9);
		},
	);

	it(
		'IEC agar phantom, α = 0.40 f + 0.0076 f² dB/cm: 4.76 / 7.71 / 11.04 dB/cm at 10 / 15 / ' +
			'20 MHz (Sun et al. 2012, Ultrasound Med Biol 38(7); case C15)',
		() => {
			const agar = {exponents: [1, 2], coefficients: [0.4, 0.0076]};
			expect(pathDb(agar, 10)).toBeCloseTo(4.76, 2);
			expect(pathDb(agar, 15)).toBeCloseTo(7.71, 2);
			expect(pathDb(agar, 20)).toBeCloseTo(11.04, 2);
		},
	);

	it('QA phantom grades 0.5 and 0.7 dB/cm/MHz at 1540 m/s (IEC 61391 / IEC 61685 targets, from memory)', () => {
		expect(libraryTissue('phantom')).toMatchObject({speedMps: 1540, alphaDbPerCmMhz: 0.5, exponent: 1});
		expect(libraryTissue('phantom-07')).toMatchObject({speedMps: 1540, alphaDbPerCmMhz: 0.7});
	});

	it('the exponent table: α0 = 0.5 with n = 1.1 / 1.2 / 1.5 at 10 MHz gives 6.29 / 7.92 / 15.81 dB/cm (tissue table §4b, computed)', () => {
		expect(pathDb({exponents: [1.1], coefficients: [0.5]}, 10)).toBeCloseTo(6.29, 2);
		expect(pathDb({exponents: [1.2], coefficients: [0.5]}, 10)).toBeCloseTo(7.92, 2);
		expect(pathDb({exponents: [1.5], coefficients: [0.5]}, 10)).toBeCloseTo(15.81, 2);
	});
});

describe(
	'spectral downshift of a Gaussian pulse (Kuc 1984, IEEE Trans ASSP 32(1):1–6; closed ' +
		'form derived from its Gaussian-spectrum model)',
	() => {
		const uniform = (alpha: number) => matched('uniform', 1540, alpha);

		it('−6 dB bandwidth 60 % at 3.5 MHz ⇒ σ = 0.6317 MHz (derived, case C13)', () => {
			expect(sigmaFromBandwidth(3.5, 0.6)).toBeCloseTo(0.6317, 4);
		});

		it('f0 = 5 MHz, σ = 1 MHz, β = 0.5, z = 4 cm: echo centre 4.079 MHz, loss 18.158 dB against 20.000 narrowband (case C12)', () => {
			const p = plan([{tissue: uniform(0.5), thicknessCm: 10}], {
				centerMhz: 5,
				bandwidthFraction: bandwidthForSigma(5, 1),
			});
			const at = pathModelOf(p).at(4);
			expect(at.attenuationDb).toBeCloseTo(18.158, 3);
			expect(at.echoCenterMhz).toBeCloseTo(4.079, 3);
		});

		it('closed form L = A·(f0 + fc), fc = f0 − 0.4605·σ²·A holds at every depth while fc stays well above 0', () => {
			const p = plan([{tissue: uniform(0.5), thicknessCm: 10}], {
				centerMhz: 5,
				bandwidthFraction: bandwidthForSigma(5, 1),
			});
			const model = pathModelOf(p);
			// The closed form integrates over all real f; the spectrum lives on f > 0, which the engine
			// honours, so the two agree only while fc is several σ above 0 (here fc ≥ 3.8σ).
			for (const z of [0.5, 1, 2, 3, 4, 5]) {
				const a = 0.5 * z;
				const fc = 5 - (Math.log(10) / 5) * a;
				expect(model.at(z).attenuationDb).toBeCloseTo(a * (5 + fc), 3);
				expect(model.at(z).echoCenterMhz).toBeCloseTo(fc, 3);
			}
		});

		it('3.5 MHz at 60 % bandwidth, β = 0.5, z = 10 cm: loss 30.41 dB against 35 dB narrowband, downshift 0.919 MHz (case C13)', () => {
			const p = plan([{tissue: uniform(0.5), thicknessCm: 20}], {centerMhz: 3.5, bandwidthFraction: 0.6});
			const at = pathModelOf(p).at(10);
			expect(at.attenuationDb).toBeCloseTo(30.41, 2);
			expect(3.5 - at.echoCenterMhz).toBeCloseTo(0.919, 3);
		});

		it(
			'backscatter ∝ f^1.4 and f^4 (Rayleigh) change the loss at 4 cm to 19.371 / 21.274 dB, ' +
				'centroids 4.414 / 4.923 MHz (numerical integration, case C14)',
			() => {
				for (const [m, loss, centroid] of [
					[1.4, 19.371, 4.414],
					[4, 21.274, 4.923],
				] as const) {
					const p = plan([{tissue: uniform(0.5), thicknessCm: 10}], {
						centerMhz: 5,
						bandwidthFraction: bandwidthForSigma(5, 1),
						scattererExponent: m,
					});
					const at = pathModelOf(p).at(4);
					expect(at.attenuationDb).toBeCloseTo(loss, 3);
					expect(at.echoCenterMhz).toBeCloseTo(centroid, 3);
				}
			},
		);
	},
);

describe('displayed versus true depth at an assumed 1540 m/s', () => {
	it('4 cm of fat at 1450 m/s is drawn at 4.248 cm (+6.21 %), echo time 55.17 µs (speed-error rule, from memory; derived, case C9)', () => {
		const spans = layerSpans([{tissue: custom('fat 1450', 1450, 911, 0.6), thicknessCm: 10}], 1540);
		expect(displayedDepthOf(spans, 4)).toBeCloseTo(4.248, 3);
		expect(echoTimeUs(spans, 4, 1540)).toBeCloseTo(55.17, 2);
	});

	it('fat 6 cm/1450 + muscle 2 cm/1580 + liver 6 cm/1570: t = 184.51 µs, displayed 14.207 cm for a true 14 cm (derived, case C10)', () => {
		const spans = layerSpans(
			[
				{tissue: custom('fat', 1450, 911, 0.6), thicknessCm: 6},
				{tissue: custom('muscle', 1580, 1050, 0.96), thicknessCm: 2},
				{tissue: custom('liver', 1570, 1060, 0.5), thicknessCm: 20},
			],
			1540,
		);
		expect(echoTimeUs(spans, 14, 1540)).toBeCloseTo(184.51, 2);
		expect(displayedDepthOf(spans, 14)).toBeCloseTo(14.207, 3);
	});
});

describe(
	'layered abdominal test vector at 3.5 MHz (tissue table worked example 4c; skin ρ and n, ' +
		'fat n, liver n and c from memory)',
	() => {
		const layers = [
			{tissue: tissue('skin'), thicknessCm: 0.2},
			{tissue: tissue('fat'), thicknessCm: 2},
			{tissue: tissue('muscle'), thicknessCm: 1},
			{tissue: tissue('liver'), thicknessCm: 20},
		];

		it('narrowband: 47.42 dB of attenuation at the liver bottom (true 11.2 cm), drawn at 11.11 cm; interfaces add 0.30 dB', () => {
			const p = plan(layers, {centerMhz: 3.5, bandwidthFraction: 0});
			const model = pathModelOf(p);
			const shown = displayedDepthOf(model.spans, 11.2);
			expect(shown).toBeCloseTo(11.11, 2);
			const at = model.at(shown);
			expect(at.trueDepthCm).toBeCloseTo(11.2, 9);
			expect(at.attenuationDb).toBeCloseTo(47.42, 2);
			expect(at.interfaceLossDb).toBeCloseTo(0.3, 2);
		});

		it('the curve at the liver bottom compensates attenuation plus interfaces (47.72 dB)', () => {
			const r = computeCurve(plan(layers, {centerMhz: 3.5, bandwidthFraction: 0, depthCm: 16}), {stepCm: 0.01});
			const s = r.samples.reduce((a, b) => (Math.abs(b.trueDepthCm - 11.2) < Math.abs(a.trueDepthCm - 11.2) ? b : a));
			const perCm = 2 * 0.5 * 3.5 ** 1.1; // liver round-trip slope, to correct the 0.01 cm grid offset
			expect(s.compensationDb + (11.2 - s.trueDepthCm) * perCm).toBeCloseTo(47.72, 1);
		});
	},
);

describe(
	'penetration from a phantom measurement (derived: the loss depends only on Σβ·d; IEC ' +
		'61391-2:2010 depth-of-penetration method)',
	() => {
		// Impedances matched so that interfaces add nothing, as in the worked case.
		const layers = [
			{tissue: matched('fat', 1450, 0.63), thicknessCm: 6},
			{tissue: matched('muscle', 1580, 0.96), thicknessCm: 1.5},
			{tissue: matched('liver', 1570, 0.5), thicknessCm: 30},
		];

		for (const bandwidth of [0, 0.6]) {
			it(
				'DOP 16 cm in a 0.5 dB/cm/MHz phantom at 3.5 MHz ⇒ the patient reaches true 13.06 cm, ' +
					`displayed 13.29 cm (bandwidth ${bandwidth})`,
				() => {
					const budget = noiseBudgetFromPhantom(
						{centerMhz: 3.5, depthCm: 16, alphaDbPerCmMhz: 0.5},
						{bandwidthFraction: bandwidth},
						0,
					);
					const p = plan(layers, {centerMhz: 3.5, bandwidthFraction: bandwidth, depthCm: 20, noiseBudgetDb: budget});
					const r = computeCurve(p);
					expect(r.penetrationDepthCm).not.toBeNull();
					expect(r.penetrationDepthCm!).toBeCloseTo(13.29, 2);
					const at = pathModelOf(p).at(r.penetrationDepthCm!);
					expect(at.trueDepthCm).toBeCloseTo(13.06, 2);
					if (bandwidth > 0) expect(at.echoCenterMhz).toBeCloseTo(2.03, 2);
				},
			);
		}
	},
);

describe('barriers: warn, do not compensate', () => {
	it('soft tissue over cortical bone: the curve is held flat below the bone surface and a warning names the depth', () => {
		const p = plan([
			{tissue: tissue('soft-tissue'), thicknessCm: 3},
			{tissue: tissue('cortical-bone'), thicknessCm: 1},
			{tissue: tissue('soft-tissue'), thicknessCm: 10},
		]);
		const r = computeCurve(p);
		expect(r.blockedDepthCm).toBeCloseTo(3, 9);
		const below = r.samples.filter((s) => s.displayedDepthCm > 3);
		expect(below.every((s) => s.blocked)).toBe(true);
		const flat = new Set(below.map((s) => s.compensationDb.toFixed(9)));
		expect(flat.size).toBe(1);
		expect(r.warnings.find((w) => w.code === 'strong-reflector')?.depthCm).toBeCloseTo(3, 9);
		expect(r.usableDepthCm).toBeCloseTo(3, 9);
	});

	it('muscle over lung (effective medium): pleura stops the curve (Sperandeo et al. 2019: > 96 % reflected)', () => {
		const r = computeCurve(
			plan([
				{tissue: tissue('muscle'), thicknessCm: 2},
				{tissue: tissue('lung'), thicknessCm: 10},
			]),
		);
		expect(r.blockedDepthCm).toBeCloseTo((2 * 1540) / 1580, 6);
		expect(r.warnings.map((w) => w.code)).toContain('strong-reflector');
	});

	it('soft-tissue interfaces never count as barriers (tissue table 4a: each < 0.2 dB)', () => {
		const r = computeCurve(
			plan([
				{tissue: tissue('skin'), thicknessCm: 0.2},
				{tissue: tissue('fat'), thicknessCm: 3},
				{tissue: tissue('muscle'), thicknessCm: 1},
				{tissue: tissue('tendon'), thicknessCm: 0.5},
				{tissue: tissue('liver'), thicknessCm: 10},
			]),
		);
		expect(r.blockedDepthCm).toBeNull();
	});
});

describe('tissue library bookkeeping', () => {
	it('every tissue names its sources, and its nominal values sit inside its published spread', async () => {
		const {allLibraryTissues} = await import('../../src/engine/tissue-library.js');
		for (const t of allLibraryTissues()) {
			expect(t.source, t.id).toBeTruthy();
			for (const key of ['speedMps', 'densityKgM3', 'alphaDbPerCmMhz', 'exponent'] as const) {
				const range = t.spread?.[key];
				if (!range) continue;
				expect(t[key], `${t.id}.${key}`).toBeGreaterThanOrEqual(range[0] - 1e-9);
				expect(t[key], `${t.id}.${key}`).toBeLessThanOrEqual(range[1] + 1e-9);
			}
		}
	});

	it(
		'the library stores one-way coefficients: liver 0.5, fat 0.6, muscle across fibres 0.96 ' +
			'dB/cm at 1 MHz (Diagnostics 2023 Table 4; Breast USCT 2016 Table I)',
		() => {
			expect(tissue('liver').alphaDbPerCmMhz).toBe(0.5);
			expect(tissue('fat').alphaDbPerCmMhz).toBe(0.6);
			expect(tissue('muscle').alphaDbPerCmMhz).toBe(0.96);
		},
	);
});

describe('noise budget from a plan file with a phantom calibration', () => {
	it('narrowband: a 3.5 MHz probe reaching 16 cm in a 0.5 dB/cm/MHz phantom has a 56 dB budget (2·0.5·3.5·16, derived)', async () => {
		const {parsePlan} = await import('../../src/plan/resolve-plan.js');
		const r = parsePlan({
			layers: [{tissue: 'liver', thicknessCm: 10}],
			probe: {centerMhz: 3.5, bandwidthFraction: 0},
			phantomCalibration: {centerMhz: 3.5, depthCm: 16, alphaDbPerCmMhz: 0.5},
		});
		expect(r.ok).toBe(true);
		if (r.ok) expect(r.value.plan.noiseBudgetDb).toBeCloseTo(56, 9);
	});
});

describe('below the usable depth the controls hold the compensation flat', () => {
	it('sliders wholly below a bone surface cancel the built-in ramp instead of adding gain (common practice, no source)', async () => {
		const {deliveredCompensationDb} = await import('../../src/engine/compensation-curve.js');
		const p = {
			...plan([
				{tissue: tissue('soft-tissue'), thicknessCm: 5},
				{tissue: tissue('cortical-bone'), thicknessCm: 1},
				{tissue: tissue('soft-tissue'), thicknessCm: 10},
			]),
			sliders: {
				count: 8,
				minDb: -60,
				maxDb: 60,
				knots: 'band-centres' as const,
				ends: 'flat' as const,
				rampDbPerCmMhz: 0.5,
			},
		};
		const r = computeCurve(p);
		const free = r.fit.sliders.filter((_, k) => k > 0 && r.fit.sliders[k - 1]!.depthCm >= r.usableDepthCm);
		expect(free.length).toBeGreaterThan(0);
		const held = deliveredCompensationDb(p, r.fit, free[0]!.depthCm);
		for (const s of free) expect(deliveredCompensationDb(p, r.fit, s.depthCm)).toBeCloseTo(held, 6);
	});
});
