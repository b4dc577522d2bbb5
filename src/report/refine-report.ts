/**
 * Text and JSON of a refinement. The JSON keeps the contract keys (`bands`, `sliders`,
 * `masterGainDb`, `attenuation`, `warnings`) and adds the figures behind them.
 */
import type {RefineResult} from '../analysis/refine-image.js';
import {cautionLine} from './cautions.js';
import {signedDb} from './curve-summary.js';

/** Cautions every refine output carries. */
export const refineCautions: readonly string[] = [
	'A measured correction for a qualified operator, not a diagnosis: confirm it on the live image.',
	'An image taken with other settings than those stated gives wrong corrections.',
	cautionLine,
];

const r2 = (x: number) => Math.round(x * 100) / 100;
const r3 = (x: number) => Math.round(x * 1000) / 1000;
const finiteOrNull = (x: number, round: (v: number) => number = r2) => (Number.isFinite(x) ? round(x) : null);

export interface RefineSource {
	readonly image: string;
	readonly frame: number | null;
	readonly plan: string;
	readonly depthScale: string;
}

export function refineJson(r: RefineResult, source: RefineSource) {
	const a = r.attenuation;
	return {
		image: source.image,
		frame: source.frame,
		plan: source.plan,
		calibrated: r.levelMap.calibrated,
		levelMap: r.levelMap.label,
		depthScale: source.depthScale,
		bands: r.bands.map((b) => ({
			depthCm: r3(b.depthCm),
			levelDb: finiteOrNull(b.levelDb),
			usable: b.usable,
			verdict: b.verdict,
			expectedDb: r2(b.expectedDb),
			residualDb: finiteOrNull(b.residualDb),
			correctedDb: finiteOrNull(b.correctedDb),
			cells: Math.round(b.cells),
			halfWidthDb: finiteOrNull(b.halfWidthDb),
			echoToNoiseDb: finiteOrNull(b.echoToNoiseDb, (v) => Math.round(v * 10) / 10),
			maskedFraction: r3(b.maskedFraction),
			fitted: b.fitted,
		})),
		sliders: r.sliders.map((s) => ({
			depthCm: r3(s.depthCm),
			gainDb: r2(s.gainDb),
			correctionDb: r2(s.correctionDb),
			...(s.correctionTravel !== null ? {correctionTravel: r3(s.correctionTravel)} : {}),
		})),
		masterGainDb: r2(r.masterGainDb),
		masterCorrectionDb: r2(r.masterCorrectionDb),
		appliedSettings: {
			sliders: r.applied.slidersDb.map(r2),
			masterGainDb: r2(r.applied.masterGainDb),
			from: r.appliedIsPlanFit ? 'plan' : 'stated',
		},
		attenuation: a
			? {
					layer: a.layerIndex + 1,
					label: a.label,
					alphaDbPerCmMhz: r3(a.alphaDbPerCmMhz),
					low: r3(a.low),
					high: r3(a.high),
					sd: r3(a.sd),
					planAlphaDbPerCmMhz: a.planAlphaDbPerCmMhz,
					bandsUsed: a.bandsUsed,
				}
			: null,
		cannotTell: r.cannotTell,
		uncalibrated: r.uncalibrated,
		speckleCellAreaPx: r2(r.cellAreaPx),
		maskedPixels: r.mask.maskedPx,
		warnings: r.warnings.map((w) => ({code: w.code, message: w.message})),
		cautions: refineCautions,
	};
}

export function refineText(r: RefineResult, source: RefineSource): string {
	const out: string[] = [];
	out.push(`Refinement of ${source.plan} from ${source.image}${source.frame ? `, frame ${source.frame}` : ''}`);
	out.push(
		`  ${r.levelMap.calibrated ? 'Calibrated' : 'UNCALIBRATED'}: ${r.levelMap.label}; depth from ${source.depthScale}.`,
	);
	out.push(
		`  Settings: ${r.appliedIsPlanFit ? "the plan's own fit (none stated)" : 'as stated'}; speckle cell ≈ ${r.cellAreaPx.toFixed(1)} px.`,
	);
	out.push('');
	out.push('  depth cm   level dB  expected  residual   cells    ±95%  echo/noise  after   band');
	for (const b of r.bands) {
		const f = (x: number, w: number, d = 1) => (Number.isFinite(x) ? x.toFixed(d) : '–').padStart(w);
		const verdict = b.usable ? (b.fitted ? 'usable, fitted' : 'usable') : b.verdict.replace(/-/g, ' ');
		out.push(
			`  ${f(b.depthCm, 8)}  ${f(b.levelDb, 9)}  ${f(b.expectedDb, 8)} ` +
				` ${Number.isFinite(b.residualDb) ? signedDb(b.residualDb - r.offsetDb).padStart(8) : '–'.padStart(8)} ` +
				` ${String(Math.round(b.cells)).padStart(6)}  ${f(b.halfWidthDb, 6, 2)}  ${f(b.echoToNoiseDb, 10, 0)} ` +
				` ${f(b.correctedDb, 6)}   ${verdict}`,
		);
	}
	out.push(
		`  (residual: measured − expected, less the image's offset of ${r.offsetDb.toFixed(1)} dB; "after": tissue level ` +
			`once the corrections are set)`,
	);
	out.push('');
	const a = r.attenuation;
	if (a) {
		out.push(
			`  Attenuation, layer ${a.layerIndex + 1} (${a.label}): α0 ${a.alphaDbPerCmMhz.toFixed(2)} dB/cm/MHz, 95 % interval ` +
				`${a.low.toFixed(2)}–${a.high.toFixed(2)} (plan ${a.planAlphaDbPerCmMhz}; ${a.bandsUsed} bands)`,
		);
	} else {
		out.push(`  Attenuation: not measured — ${r.cannotTell}`);
	}
	out.push('');
	out.push('  slider  depth cm   set to dB   change dB');
	r.sliders.forEach((s, k) => {
		const travel =
			s.correctionTravel === null
				? ''
				: `  (${s.correctionTravel >= 0 ? '+' : '−'}${Math.abs(s.correctionTravel).toFixed(2)} of travel)`;
		out.push(
			`  ${String(k + 1).padStart(6)}  ${s.depthCm.toFixed(1).padStart(8)}  ${s.gainDb.toFixed(1).padStart(10)} ` +
				` ${signedDb(s.correctionDb).padStart(10)}${travel}`,
		);
	});
	out.push(
		`  master  ${''.padStart(8)}  ${r.masterGainDb.toFixed(1).padStart(10)}  ${signedDb(r.masterCorrectionDb).padStart(10)}`,
	);
	out.push('');
	for (const w of r.warnings) out.push(`  ! ${w.message}`);
	for (const c of refineCautions) out.push(`  ${c}`);
	return out.join('\n') + '\n';
}
