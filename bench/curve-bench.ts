/**
 * Engine benchmark: the fast broadband path against the brute-force integration on the same
 * 10-layer plan, and throughput of whole curves (loss, band, fit) over varied plans.
 */
import {performance} from 'node:perf_hooks';
import {bruteForceAttenuationDb} from '../src/engine/brute-force-loss.js';
import {computeCurve, pathModelOf, sampleDepths} from '../src/engine/compensation-curve.js';
import {libraryTissue} from '../src/engine/tissue-library.js';
import type {EnginePlan, Tissue} from '../src/engine/types.js';
import {medianMs, report, seeded} from './bench-tools.js';

const t = (id: string): Tissue => libraryTissue(id)!;

/** Ten soft-tissue layers with several exponents, broadband, displayed to 30 cm. */
export function tenLayerPlan(): EnginePlan {
	const ids = ['skin', 'fat', 'muscle', 'fat', 'muscle', 'liver', 'cyst-fluid', 'liver', 'kidney', 'spleen'];
	return {
		name: 'bench ten layers',
		region: 'bench',
		layers: ids.map((id, i) => ({tissue: t(id), thicknessCm: i === ids.length - 1 ? 20 : 0.2 + (i % 3) * 1.3})),
		probe: {centerMhz: 3.5, bandwidthFraction: 0.8, harmonic: false},
		scattererExponent: 1.4,
		display: {depthCm: 30, assumedSpeedMps: 1540},
		sliders: {count: 10, minDb: -15, maxDb: 15, knots: 'band-centres', ends: 'flat', rampDbPerCmMhz: 0.5},
		masterGain: {minDb: 0, maxDb: 60, baseDb: 30},
		noiseBudgetDb: 200,
	};
}

export async function run(): Promise<void> {
	console.log('curve engine');
	const plan = tenLayerPlan();
	const depths = sampleDepths(30, 0.05);
	const fast = () => {
		const m = pathModelOf(plan);
		return depths.map((d) => m.at(d).attenuationDb);
	};
	const fastMs = medianMs(fast, 20);
	const t0 = performance.now();
	const reference = bruteForceAttenuationDb(plan, depths, {points: 20000});
	const bruteMs = performance.now() - t0;
	const fastValues = fast();
	const maxDiff = Math.max(...fastValues.map((v, i) => Math.abs(v - reference[i]!)));
	report('10-layer broadband attenuation, 601 samples (0.05 cm over 30 cm), fast path', `${fastMs.toFixed(2)} ms`);
	report('same samples, brute-force 20,000-point integration', `${bruteMs.toFixed(0)} ms`);
	report('speed ratio brute force / fast', `${(bruteMs / fastMs).toFixed(0)}x`, '>= 50x', bruteMs / fastMs >= 50);
	report('largest difference', `${maxDiff.toFixed(5)} dB`, '<= 0.05 dB', maxDiff <= 0.05);
	report('whole curve (loss, band, fit) for the same plan at 0.05 cm', `${medianMs(() => computeCurve(plan, {stepCm: 0.05}), 10).toFixed(2)} ms`);

	const rand = seeded(7);
	const pool = ['fat', 'muscle', 'liver', 'kidney', 'spleen', 'soft-tissue', 'breast', 'cyst-fluid', 'urine', 'blood', 'skin', 'tendon'];
	const plans: EnginePlan[] = Array.from({length: 10_000}, (_, i) => {
		const n = 1 + Math.floor(rand() * 8);
		return {
			...plan,
			name: `varied ${i}`,
			layers: Array.from({length: n}, () => ({tissue: t(pool[Math.floor(rand() * pool.length)]!), thicknessCm: 0.2 + rand() * 6})),
			probe: {centerMhz: 2 + rand() * 10, bandwidthFraction: rand() < 0.2 ? 0 : 0.3 + rand() * 0.7, harmonic: rand() < 0.2},
			display: {depthCm: 4 + rand() * 20, assumedSpeedMps: 1540},
			sliders: {...plan.sliders, count: 6 + Math.floor(rand() * 7)},
			noiseBudgetDb: 50 + rand() * 40,
		};
	});
	const t1 = performance.now();
	for (const p of plans) computeCurve(p);
	const seconds = (performance.now() - t1) / 1000;
	report('10,000 varied plans (0.1 cm steps, fit included)', `${(plans.length / seconds).toFixed(0)} curves/s (${seconds.toFixed(1)} s)`);
}
