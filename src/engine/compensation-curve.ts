/**
 * The compensation curve: for each displayed depth, the gain (dB) that makes the reference
 * scatterer's echo as strong as it is right under the skin, with its uncertainty band, the noise
 * floor, any barrier, and the sliders fitted to it.
 *
 * TGC should undo propagation losses only (attenuation and interfaces); differences in intrinsic
 * echogenicity between layers carry diagnostic contrast and are left alone.
 */
import {lateralShiftMm, refractedAnglesDeg} from './beam-angle.js';
import {PathModel, type Barrier} from './path-model.js';
import {appliedGainDb} from './slider-basis.js';
import {type FitMemory, fitSliders} from './slider-fit.js';
import {receiveWarnings} from './receive-notes.js';
import type {CurveResult, CurveSample, CurveWarning, EnginePlan, Layer, SliderFit} from './types.js';
import {columnsAlongDepth} from './points-along-depth.js';
import {bandDepths, uncertaintyBand} from './uncertainty-band.js';

/** Identifies the physics and fitting model in every output, so tables stay traceable. */
export const modelVersion =
	"evenecho-model 2 (1-D parallel layers at the plan's beam angle, pulse-echo spectrum of the probe's steepness, " +
	'fundamental or harmonic receive)';

export interface CurveOptions {
	/** Spacing of the samples in displayed depth, cm. @default 0.1 */
	readonly stepCm?: number;
	/**
	 * Work out the uncertainty band (lowDb/highDb). Callers that never show it (tables, the fit of a
	 * template, the simulator) pass false: the band costs 4–16 extra loss models, the most of a tissue-harmonic
	 * curve's time. Without it lowDb = highDb = compensationDb. @default true
	 */
	readonly band?: boolean;
	/**
	 * Keep the per-depth samples in the result. Callers that want only the fit and the depths (the
	 * protocol table, a row at a time) pass false: the samples were a seventh of what a row allocated.
	 * Without them `samples` is empty; nothing else changes. @default true
	 */
	readonly samples?: boolean;
}

/** Fit residual above which a warning says the sliders cannot follow the curve, dB. */
const residualWarningDb = 2;
/** Layer speeds further than this from the assumed speed get a depth-error note. */
const speedNoteFraction = 0.03;

/** Samples from 0 to the display depth, the last one exactly on it. */
export function sampleDepths(depthCm: number, stepCm: number): number[] {
	const n = Math.max(1, Math.round(depthCm / stepCm));
	const exact = Math.abs(n * stepCm - depthCm) < 1e-9;
	const out: number[] = [];
	for (let i = 0; i <= n; i++) {
		const d = i * stepCm;
		if (d < depthCm - 1e-9) out.push(Math.round(d * 1e9) / 1e9);
	}
	if (!exact || out.length === n) out.push(depthCm);
	return out;
}

/**
 * Gain the scanner's own depth ramp gives at a displayed depth with every slider centred, dB:
 * round trip at the slider bank's ramp slope (out at f0 and back at f0, or at 2·f0 with harmonic receive).
 */
export function builtInRampDb(plan: EnginePlan, displayedCm: number): number {
	if (plan.scanner) return measuredResponseDb(plan.scanner, displayedCm);
	const harmonic = (plan.probe.receive ?? 'fundamental') !== 'fundamental';
	const legsMhz = harmonic ? 3 * plan.probe.centerMhz : 2 * plan.probe.centerMhz;
	return plan.sliders.rampDbPerCmMhz * legsMhz * displayedCm;
}

/**
 * The measured depth response at a displayed depth, dB re the skin: linear between the measured
 * depths, held at the end values outside them (nothing is known there, so nothing is invented).
 */
export function measuredResponseDb(r: NonNullable<EnginePlan['scanner']>, displayedCm: number): number {
	const xs = r.depthsCm;
	const ys = r.gainDb;
	const n = xs.length;
	if (!n) return 0;
	if (displayedCm <= xs[0]!) return ys[0]!;
	if (displayedCm >= xs[n - 1]!) return ys[n - 1]!;
	let i = 1;
	while (xs[i]! < displayedCm) i++;
	const t = (displayedCm - xs[i - 1]!) / (xs[i]! - xs[i - 1]!);
	return ys[i - 1]! + t * (ys[i]! - ys[i - 1]!);
}

/** What master gain + sliders must add at a sample: the compensation less the built-in ramp, on the
 * master gain's own scale. */
export function controlTargetDb(plan: EnginePlan, s: Pick<CurveSample, 'displayedDepthCm' | 'compensationDb'>): number {
	return s.compensationDb - builtInRampDb(plan, s.displayedDepthCm) + plan.masterGain.baseDb;
}

/**
 * Compensation the fitted controls deliver at a displayed depth, dB relative to the skin: the
 * built-in ramp plus master gain plus the interpolated sliders, less the master's skin-level base.
 * Comparable with CurveSample.compensationDb.
 */
export function deliveredCompensationDb(plan: EnginePlan, fit: SliderFit, displayedCm: number): number {
	const knots = fit.sliders.map((s) => s.depthCm);
	const values = fit.sliders.map((s) => s.gainDb);
	return (
		builtInRampDb(plan, displayedCm) +
		appliedGainDb(knots, plan.sliders.ends, values, fit.masterGainDb, displayedCm) -
		plan.masterGain.baseDb
	);
}

/**
 * Sliders that act only below the usable depth (the previous knot is already past it) are set so
 * that the delivered compensation stays at its value there: below a barrier or the noise floor more
 * gain brightens only noise, and the scanner's own ramp would otherwise keep adding it. They cannot
 * change the fit over the usable range, so its residual stands.
 */
function holdFlatBeyond(plan: EnginePlan, fit: SliderFit, usableDepthCm: number, heldDb: number): SliderFit {
	const {minDb, maxDb} = plan.sliders;
	const sliders = fit.sliders.map((s, k) => {
		const previous = fit.sliders[k - 1];
		if (!previous || previous.depthCm < usableDepthCm) return s;
		const wanted = heldDb - builtInRampDb(plan, s.depthCm) + plan.masterGain.baseDb - fit.masterGainDb;
		return {depthCm: s.depthCm, gainDb: Math.min(maxDb, Math.max(minDb, wanted))};
	});
	return {...fit, sliders};
}

/** Builds the loss model of a plan's nominal layers. */
export function pathModelOf(plan: EnginePlan, layers: readonly Layer[] = plan.layers): PathModel {
	return new PathModel(layers, plan.probe, plan.scattererExponent, plan.display.assumedSpeedMps);
}

/** Fat under the skin beyond which a plan gets the body-wall note, cm (the "about 3 cm";
 * common practice, no source). */
const thickWallCm = 3;

/** Fat in the first layers under the skin (skin itself passed over), cm. */
function bodyWallFatCm(plan: EnginePlan): number {
	let fat = 0;
	for (const l of plan.layers.slice(0, -1)) {
		const t = l.tissue;
		if (t.id === 'skin') continue;
		if (t.id === 'fat' || (!t.id && /fat|adipose/i.test(t.label))) fat += l.thicknessCm;
		else break;
	}
	return fat;
}

/** One line for a thick body wall: what changes, and what gain cannot fix. */
function bodyWallNote(plan: EnginePlan): CurveWarning | null {
	const fat = bodyWallFatCm(plan);
	if (fat <= thickWallCm) return null;
	return {
		code: 'thick-body-wall',
		severity: 'note',
		message:
			`${fat.toFixed(1)} cm of fat under the skin: fat and liver lose about the same per cm, so the slider shape ` +
			`barely changes; what changes is depth (the target sits deeper, so the highest frequency that reaches it falls, and ` +
			`the sliders follow the displayed depth, fat drawn about 7 % thick). Gain cannot fix the clutter and aberration the ` +
			`body wall adds; tissue harmonic receive reduces them (Pinton, Trahey & Dahl 2011, "Sources of image degradation in ` +
			`fundamental and harmonic ultrasound imaging using nonlinear, full-wave simulations", IEEE TUFFC; Dahl & Sheth ` +
			`2014, "Reverberation clutter from subcutaneous tissue layers: simulation and in vivo demonstrations", Ultrasound ` +
			`Med Biol 40(4):714–726).`,
	};
}

/** Smallest sideways shift worth a note, mm. */
const refractionNoteMm = 1;

/** The refraction artefact of an oblique beam: where the deepest usable target is drawn sideways. */
function refractionNote(plan: EnginePlan, usableDepthCm: number, model: PathModel): CurveWarning | null {
	const angle = plan.probe.angleDeg ?? 0;
	if (angle === 0) return null;
	// Depth normal to the layers of the point at the usable displayed depth along the beam.
	const span = model.spans.find((s) => usableDepthCm <= s.shownBottomCm) ?? model.spans[model.spans.length - 1]!;
	const along = span.trueTopCm + (usableDepthCm - span.shownTopCm) / span.stretch;
	const angles = refractedAnglesDeg(plan.layers, angle);
	let normal = 0;
	for (const s of model.spans) {
		const take = Math.min(along, s.trueBottomCm) - s.trueTopCm;
		if (take <= 0) break;
		normal += take * Math.cos(((angles[s.index] ?? 0) * Math.PI) / 180);
	}
	const mm = lateralShiftMm(plan.layers, angle, normal);
	if (mm === null || mm < refractionNoteMm) return null;
	return {
		code: 'refraction-shift',
		severity: 'note',
		message:
			`At ${angle}° the beam bends at each boundary (Snell's law) while the scanner draws along a straight line: ` +
			`a target at ${usableDepthCm.toFixed(1)} cm is drawn about ${mm.toFixed(1)} mm sideways of where it is (refraction ` +
			`artefact). Path lengths follow the bent beam.`,
		depthCm: usableDepthCm,
	};
}

function barrierWarning(b: Barrier, plan: EnginePlan): CurveWarning {
	const label = plan.layers[b.layerIndex]?.tissue.label ?? 'layer';
	const depth = b.displayedCm.toFixed(1);
	if (b.criticalAngleDeg !== undefined) {
		const above = plan.layers[b.layerIndex - 1]?.tissue.label ?? 'layer';
		return {
			code: b.kind,
			severity: 'warning',
			message:
				`At ${plan.probe.angleDeg}° the beam meets ${above} → ${label} at ${depth} cm beyond its critical angle ` +
				`(${b.criticalAngleDeg.toFixed(1)}°): no energy crosses, nothing returns from beyond. Tilt the probe towards the ` +
				`normal; gain cannot help.`,
			depthCm: b.displayedCm,
		};
	}
	const message =
		b.kind === 'strong-reflector'
			? `${label} from ${depth} cm reflects ${(b.value * 100).toFixed(0)} % of the intensity: no useful echoes beyond it. ` +
				`Gain is held flat there; more gain cannot restore what does not return.`
			: `${label} from ${depth} cm absorbs ${b.value} dB/cm/MHz one way: no useful echoes beyond it. Gain is held flat there.`;
	return {code: b.kind, severity: 'warning', message, depthCm: b.displayedCm};
}

/** Says which measured depth response replaced the built-in ramp, and where the plan's settings differ from it. */
export function scannerProfileNote(plan: EnginePlan): string {
	const r = plan.scanner!;
	const last = r.depthsCm[r.depthsCm.length - 1] ?? 0;
	const differs: string[] = [];
	if (Math.abs(r.centerMhz - plan.probe.centerMhz) > 1e-9)
		differs.push(`probe ${r.centerMhz} MHz there, ${plan.probe.centerMhz} MHz here`);
	if (Math.abs(r.displayDepthCm - plan.display.depthCm) > 1e-9)
		differs.push(`display depth ${r.displayDepthCm} cm there, ${plan.display.depthCm} cm here`);
	if (r.sliderCount !== plan.sliders.count) differs.push(`${r.sliderCount} sliders there, ${plan.sliders.count} here`);
	const base =
		`Depth gain measured on "${r.label}" (${r.id}) replaces the assumed built-in ramp, held flat beyond ` +
		`${last.toFixed(1)} cm; a measurement to confirm on the live image.`;
	return differs.length
		? `${base} Settings differ from the measurement (${differs.join('; ')}): re-measure for this probe, preset and depth.`
		: base;
}

/**
 * The part of a curve the slider bank and master gain do not touch: the samples with their band,
 * the noise floor and any barrier. Most of a curve's time; an edit of the bank alone reuses it
 * (reusablePhysics) and redoes only the fit.
 */
export interface CurvePhysics {
	readonly plan: EnginePlan;
	readonly stepCm: number;
	readonly band: boolean;
	readonly keepsSamples: boolean;
	readonly nominal: PathModel;
	readonly barrier: Barrier | null;
	/** Displayed depths of the samples, cm, and the compensation each needs, dB. */
	readonly depths: readonly number[];
	readonly compensationDb: readonly number[];
	/** Empty when worked out with `samples: false`. */
	readonly samples: readonly CurveSample[];
	readonly penetrationDepthCm: number | null;
	readonly blockedDepthCm: number | null;
	readonly usableDepthCm: number;
}

/** Computes the whole compensation curve of a plan. Pure: same plan, same result. */
export function computeCurve(plan: EnginePlan, options: CurveOptions = {}): CurveResult {
	return fitCurve(curvePhysics(plan, options), plan);
}

/** Plain data (numbers, strings, booleans, arrays, objects) equal field by field. */
function samePlainData(a: unknown, b: unknown): boolean {
	if (a === b) return true;
	if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
	if (Array.isArray(a) !== Array.isArray(b)) return false;
	const keysA = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
	const keysB = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
	if (keysA.length !== keysB.length) return false;
	return keysA.every((k) => samePlainData((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/**
 * `physics` when it holds for `plan` (worked out with the same options for a plan that differs at
 * most in its slider bank, master gain or scanner response, which act only on the fit), else
 * undefined.
 */
export function reusablePhysics(
	physics: CurvePhysics | undefined,
	plan: EnginePlan,
	options: CurveOptions = {},
): CurvePhysics | undefined {
	if (
		!physics ||
		physics.stepCm !== (options.stepCm ?? 0.1) ||
		physics.band !== (options.band !== false) ||
		physics.keepsSamples !== (options.samples !== false)
	)
		return undefined;
	const {sliders: _a, masterGain: _b, scanner: _c, ...rest} = plan;
	const {sliders: _d, masterGain: _e, scanner: _f, ...before} = physics.plan;
	return samePlainData(rest, before) ? physics : undefined;
}

/** The samples, band, noise floor and barrier of a plan (see CurvePhysics). */
export function curvePhysics(plan: EnginePlan, options: CurveOptions = {}): CurvePhysics {
	const stepCm = options.stepCm ?? 0.1;
	const depthCm = plan.display.depthCm;
	const nominal = pathModelOf(plan);

	const barrier = nominal.barrier && nominal.barrier.displayedCm < depthCm ? nominal.barrier : null;
	const blockedDepthCm = barrier ? barrier.displayedCm : null;
	const depths = sampleDepths(depthCm, stepCm);
	const points = columnsAlongDepth(nominal, depths);
	const centroidAt = (d: number): number => {
		let i = 0;
		while (i < depths.length - 1 && depths[i + 1]! <= d) i++;
		return points.echoCenterMhz[i]!;
	};
	const band = options.band === false ? null : uncertaintyBand(plan, bandDepths(plan, depths), centroidAt);
	// Without the band both its ends are the curve itself.
	const bandAt = (d: number, loss: number) => (band ? band.at(d) : {lowDb: loss, highDb: loss});
	const heldLoss = blockedDepthCm === null ? 0 : nominal.lossAt(blockedDepthCm);
	const heldAt = blockedDepthCm === null ? null : {nominal: heldLoss, ...bandAt(blockedDepthCm, heldLoss)};
	// What the fit needs per depth, worked out without a sample object each (see CurveOptions.samples).
	const compensationDb: number[] = new Array(depths.length);
	let firstOver = -1;
	for (let i = 0; i < depths.length; i++) {
		const d = depths[i]!;
		const loss = points.attenuationDb[i]! + points.interfaceLossDb[i]!;
		compensationDb[i] = heldAt !== null && d > blockedDepthCm! ? heldAt.nominal : loss;
		if (firstOver < 0 && loss > plan.noiseBudgetDb) firstOver = i;
	}
	const samples: CurveSample[] =
		options.samples === false
			? []
			: depths.map((d, i) => {
					const attenuationDb = points.attenuationDb[i]!;
					const interfaceLossDb = points.interfaceLossDb[i]!;
					const loss = attenuationDb + interfaceLossDb;
					const blocked = heldAt !== null && d > blockedDepthCm!;
					let lo = loss;
					let hi = loss;
					if (blocked) ({lowDb: lo, highDb: hi} = heldAt);
					else if (band) ({lowDb: lo, highDb: hi} = band.at(d));
					const comp = compensationDb[i]!;
					return {
						displayedDepthCm: d,
						trueDepthCm: points.trueDepthCm[i]!,
						layerIndex: points.layerIndex[i]!,
						attenuationDb,
						interfaceLossDb,
						compensationDb: comp,
						lowDb: Math.min(lo, hi, comp),
						highDb: Math.max(lo, hi, comp),
						echoCenterMhz: points.echoCenterMhz[i]!,
						blocked,
						belowNoise: loss > plan.noiseBudgetDb,
					};
				});

	// The samples bracket the noise-floor crossing already (checked exactly there; the whole range if not).
	if (nominal.receive === 'tissue-harmonic') firstOver = -1;
	const penetrationDepthCm = nominal.depthForLoss(
		plan.noiseBudgetDb,
		depthCm,
		firstOver > 0 ? {loCm: depths[firstOver - 1]!, hiCm: depths[firstOver]!} : undefined,
	);
	const usableDepthCm = Math.min(depthCm, blockedDepthCm ?? depthCm, penetrationDepthCm ?? depthCm);
	return {
		plan,
		stepCm,
		band: options.band !== false,
		keepsSamples: options.samples !== false,
		nominal,
		barrier,
		depths,
		compensationDb,
		samples,
		penetrationDepthCm,
		blockedDepthCm,
		usableDepthCm,
	};
}

/**
 * What the fit of a curve needs from its physics, as plain data (numbers, arrays, warnings): the
 * protocol table works the physics out on one thread and the fits on another, and only plain data
 * crosses between threads. Each thread then runs (and its JIT compiles) only its own half.
 */
export interface CurveFacts {
	/** Displayed depths of the samples, cm, and the compensation each needs, dB (CurvePhysics). */
	readonly depths: readonly number[];
	readonly compensationDb: ArrayLike<number>;
	readonly penetrationDepthCm: number | null;
	readonly blockedDepthCm: number | null;
	readonly usableDepthCm: number;
	/** Samples shallower than this are not fitted (the tissue harmonic's build-up zone). */
	readonly fitFromCm: number;
	/** The loss at the usable depth, dB: sliders acting only below it hold the compensation there. */
	readonly heldLossDb: number;
	/** The physics' warnings, in their place before and after the fit's own. */
	readonly warningsBefore: readonly CurveWarning[];
	readonly warningsAfter: readonly CurveWarning[];
}

/** The facts of a plan's physics (see CurveFacts); `plan` is the one the physics was worked out for. */
export function curveFacts(physics: CurvePhysics, plan: EnginePlan): CurveFacts {
	const {nominal, barrier, penetrationDepthCm, blockedDepthCm, usableDepthCm} = physics;
	const depthCm = plan.display.depthCm;
	const f0 = plan.probe.centerMhz;
	const warningsBefore: CurveWarning[] = [];
	if (barrier) warningsBefore.push(barrierWarning(barrier, plan));
	if (penetrationDepthCm !== null && (blockedDepthCm === null || penetrationDepthCm < blockedDepthCm)) {
		warningsBefore.push({
			code: 'below-noise-floor',
			severity: 'warning',
			message:
				`Beyond ${penetrationDepthCm.toFixed(1)} cm the echo at ${f0} MHz falls below the noise floor ` +
				`(${plan.noiseBudgetDb.toFixed(1)} dB budget): gain there lifts noise, not signal. Try a lower frequency, a ` +
				`shallower depth or moving the focus; any output increase is the operator's call under ALARA.`,
			depthCm: penetrationDepthCm,
		});
	}
	const warningsAfter: CurveWarning[] = [...receiveWarnings(plan)];
	const wall = bodyWallNote(plan);
	if (wall) warningsAfter.push(wall);
	const shift = refractionNote(plan, usableDepthCm, nominal);
	if (shift) warningsAfter.push(shift);
	if (plan.scanner) warningsAfter.push({code: 'scanner-profile', severity: 'note', message: scannerProfileNote(plan)});
	for (const span of nominal.spans) {
		const c = span.layer.tissue.speedMps;
		const misdrawn = span.stretch - 1;
		if (span.shownTopCm < depthCm && Math.abs(misdrawn) > speedNoteFraction) {
			if (barrier && span.shownTopCm >= barrier.displayedCm) continue;
			warningsAfter.push({
				code: 'speed-mismatch',
				severity: 'note',
				message:
					`${span.layer.tissue.label} (${c} m/s) is drawn ${Math.abs(misdrawn * 100).toFixed(1)} % ` +
					`${misdrawn > 0 ? 'thicker' : 'thinner'} than it is at the assumed ${plan.display.assumedSpeedMps} m/s; the curve ` +
					`follows displayed depth.`,
				depthCm: span.shownTopCm,
			});
		}
	}
	return {
		depths: physics.depths,
		compensationDb: physics.compensationDb,
		penetrationDepthCm,
		blockedDepthCm,
		usableDepthCm,
		fitFromCm: nominal.referenceDisplayedCm,
		// The usable depth never lies below a barrier, so this is also the held value there.
		heldLossDb: nominal.lossAt(usableDepthCm),
		warningsBefore,
		warningsAfter,
	};
}

/**
 * The slider fit of a plan on the facts of its physics, and every warning in order. `memory` carries
 * the fit's start from one curve to the next of a run (fitSliders).
 */
export function fitFacts(
	facts: CurveFacts,
	plan: EnginePlan,
	memory?: FitMemory,
): {fit: SliderFit; warnings: CurveWarning[]} {
	const {depths, usableDepthCm} = facts;
	// The ramp and any measured depth response belong to the plan's scanner: here, not in the physics.
	const targetDb = depths.map((d, i) =>
		controlTargetDb(plan, {displayedDepthCm: d, compensationDb: facts.compensationDb[i]!}),
	);
	const fitted = fitSliders(
		{
			depthsCm: depths,
			targetDb,
			usableDepthCm,
			fitFromCm: facts.fitFromCm,
			bank: plan.sliders,
			displayDepthCm: plan.display.depthCm,
			master: plan.masterGain,
		},
		memory,
	);
	const fit = holdFlatBeyond(plan, fitted, usableDepthCm, facts.heldLossDb);
	const warnings = [...facts.warningsBefore];
	if (fit.residualDb > residualWarningDb) {
		warnings.push({
			code: 'slider-range-exceeded',
			severity: 'warning',
			message:
				`Sliders and master gain miss the curve by up to ${fit.residualDb.toFixed(1)} dB (worst at ` +
				`${fit.residualAtCm.toFixed(1)} cm): the slider or master range is too narrow for this patient.`,
			depthCm: fit.residualAtCm,
		});
	}
	warnings.push(...facts.warningsAfter);
	return {fit, warnings};
}

/**
 * The slider fit and the warnings of a plan, on physics worked out for it (or reusable for it:
 * reusablePhysics).
 */
export function fitCurve(physics: CurvePhysics, plan: EnginePlan): CurveResult {
	const {samples, penetrationDepthCm, blockedDepthCm, usableDepthCm} = physics;
	const {fit, warnings} = fitFacts(curveFacts(physics, plan), plan);
	return {plan, samples, fit, penetrationDepthCm, blockedDepthCm, usableDepthCm, warnings};
}
