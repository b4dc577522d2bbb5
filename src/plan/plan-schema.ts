/**
 * The plan file format `evenecho-plan/2` (JSON): one patient/exam setup. This is the boundary
 * where outside input is checked; the engine behind it trusts what it gets. Files in the older
 * `evenecho-plan/1` are read through {@link migratePlanV1} (plan-migration.ts) and keep their meaning.
 *
 * Every field but `layers` and `probe.centerMhz` has a default. Unknown keys are refused, and every
 * message names the field path and the allowed range.
 */
import {z} from 'zod';
import {softTissueNonlinearityBA} from '../engine/nonlinearity.js';
import {printable} from '../files/printable.js';
import {safeText} from '../files/text-field.js';
import {libraryTissue, tissueIds} from '../engine/tissue-library.js';
import type {Tissue} from '../engine/types.js';
import {migratePlanInput} from './plan-migration.js';

// Each command parses a handful of documents: zod's compiled object parsers (built with new Function
// on first use) cost more to build than they save here. Global, set where the schemas are built.
z.config({jitless: true});

export const planFormat = 'evenecho-plan/2';

/** Allowed ranges, in one place so messages, the console's fields and the docs agree. */
export const limits = {
	layers: {min: 1, max: 40},
	thicknessCm: {min: 0, max: 50, exclusiveMin: true},
	speedMps: {min: 300, max: 5000},
	densityKgM3: {min: 1, max: 3000},
	alphaDbPerCmMhz: {min: 0, max: 100},
	exponent: {min: 1, max: 2.5},
	centerMhz: {min: 0, max: 50, exclusiveMin: true},
	bandwidthFraction: {min: 0, max: 1.5},
	spectrumSteepness: {min: 1, max: 10},
	nonlinearityBA: {min: 0, max: 20},
	angleDeg: {min: 0, max: 80},
	scattererExponent: {min: 0, max: 6},
	depthCm: {min: 0, max: 40, exclusiveMin: true},
	assumedSpeedMps: {min: 1400, max: 1700},
	sliderCount: {min: 1, max: 16},
	sliderDb: {min: -60, max: 60},
	masterDb: {min: -20, max: 120},
	noiseBudgetDb: {min: 0, max: 200, exclusiveMin: true},
	phantomDepthCm: {min: 0, max: 40, exclusiveMin: true},
	rampDbPerCmMhz: {min: 0, max: 2},
} as const;

/**
 * Sliders are offsets from the scanner's own ramp, assumed to compensate the 0.5 dB/cm/MHz
 * soft-tissue average (common practice, no source; the average itself: IEC 61391-2, secondary).
 * Set 0 for a scanner whose sliders are absolute.
 */
export const defaultRampDbPerCmMhz = 0.5;

export type Limit = {readonly min: number; readonly max: number; readonly exclusiveMin?: boolean};

/**
 * The one rule for a target depth, whether a plan's own `targetDepthCm` or `ladder --target`: a
 * displayed depth within the display (deeper is not on the screen the table is for).
 */
export function targetDepthLimit(displayDepthCm: number): Limit {
	return {min: 0, max: displayDepthCm, exclusiveMin: true};
}

export function withinLimit(value: number, l: Limit): boolean {
	return value <= l.max && (l.exclusiveMin ? value > l.min : value >= l.min);
}

/** "from 0 to 50 MHz" / "above 0 and up to 50 MHz". */
export function describeRange(l: Limit, unit = ''): string {
	const u = unit ? ` ${unit}` : '';
	return l.exclusiveMin ? `above ${l.min} and up to ${l.max}${u}` : `from ${l.min} to ${l.max}${u}`;
}

function ranged(l: Limit, unit = '', integer = false) {
	const range = describeRange(l, unit);
	const message = `must be ${integer ? 'a whole number' : 'a number'} ${range}`;
	let n = z.number({error: message});
	if (integer) n = n.int({error: message});
	n = l.exclusiveMin ? n.gt(l.min, {error: message}) : n.min(l.min, {error: message});
	return n.max(l.max, {error: message});
}

const customTissueSchema = z.strictObject({
	label: safeText(
		z
			.string({error: 'must be text of 1 to 60 characters'})
			.min(1, {error: 'must be text of 1 to 60 characters'})
			.max(60, {error: 'must be text of 1 to 60 characters'}),
	),
	speedMps: ranged(limits.speedMps, 'm/s'),
	densityKgM3: ranged(limits.densityKgM3, 'kg/m³'),
	alphaDbPerCmMhz: ranged(limits.alphaDbPerCmMhz, 'dB/cm/MHz^n'),
	exponent: ranged(limits.exponent),
	/** Acoustic nonlinearity B/A (tissue harmonic); absent = the soft-tissue default. */
	nonlinearityBA: ranged(limits.nonlinearityBA).optional(),
	source: safeText(z.string().max(300, {error: 'must be at most 300 characters'})).optional(),
});

/** What the probe receives (see ReceiveMode in the engine). */
export const receiveModes = ['fundamental', 'tissue-harmonic', 'scatterer-harmonic'] as const;
const receiveSchema = z.enum(receiveModes, {error: 'must be "fundamental", "tissue-harmonic" or "scatterer-harmonic"'});

const tissueIdSchema = z
	.string({error: 'must be a library tissue id or a custom tissue object'})
	.refine((id) => libraryTissue(id) !== undefined, {
		error: (issue) => `unknown tissue id "${printable(String(issue.input), 60)}"; known ids: ${tissueIds.join(', ')}`,
	});

/**
 * An attenuation coefficient measured for this patient (an attenuation measurement on the scanner,
 * or a correction worked out from an image), with its own interval. It replaces the tissue's α0 and
 * its spread; n stays the tissue's.
 */
const measuredAlphaSchema = z
	.strictObject({
		alphaDbPerCmMhz: ranged(limits.alphaDbPerCmMhz, 'dB/cm/MHz^n'),
		lowDbPerCmMhz: ranged(limits.alphaDbPerCmMhz, 'dB/cm/MHz^n'),
		highDbPerCmMhz: ranged(limits.alphaDbPerCmMhz, 'dB/cm/MHz^n'),
	})
	.refine((m) => m.lowDbPerCmMhz <= m.alphaDbPerCmMhz && m.alphaDbPerCmMhz <= m.highDbPerCmMhz, {
		error: 'the interval must hold the value: lowDbPerCmMhz ≤ alphaDbPerCmMhz ≤ highDbPerCmMhz',
		path: ['alphaDbPerCmMhz'],
	});

/** `true`: physical thickness; `displayed`: as measured on the screen (converted through the assumed speed). */
export const thicknessModes = ['true', 'displayed'] as const;
export type ThicknessMode = (typeof thicknessModes)[number];

export const layerSchema = z.strictObject({
	tissue: z.union([tissueIdSchema, customTissueSchema], {
		error: 'must be a library tissue id or a custom tissue object',
	}),
	thicknessCm: ranged(limits.thicknessCm, 'cm'),
	thicknessAs: z.enum(thicknessModes, {error: 'must be "true" or "displayed"'}).default('true'),
	measuredAlpha: measuredAlphaSchema.optional(),
});

const sliderSchema = z
	.strictObject({
		count: ranged(limits.sliderCount, '', true).default(8),
		minDb: ranged(limits.sliderDb, 'dB').default(-15),
		maxDb: ranged(limits.sliderDb, 'dB').default(15),
		knots: z
			.enum(['band-centres', 'band-edges'], {error: 'must be "band-centres" or "band-edges"'})
			.default('band-centres'),
		ends: z.enum(['flat', 'extrapolate'], {error: 'must be "flat" or "extrapolate"'}).default('flat'),
		rampDbPerCmMhz: ranged(limits.rampDbPerCmMhz, 'dB/cm/MHz').default(defaultRampDbPerCmMhz),
	})
	.refine((s) => s.minDb < s.maxDb, {error: 'minDb must be below maxDb', path: ['maxDb']});

const masterSchema = z
	.strictObject({
		minDb: ranged(limits.masterDb, 'dB').default(0),
		maxDb: ranged(limits.masterDb, 'dB').default(60),
		/** Master gain showing the tissue under the skin right with sliders centred; default mid-range. */
		baseDb: ranged(limits.masterDb, 'dB').optional(),
	})
	.refine((m) => m.minDb < m.maxDb, {error: 'minDb must be below maxDb', path: ['maxDb']})
	.refine((m) => m.baseDb === undefined || (m.baseDb >= m.minDb && m.baseDb <= m.maxDb), {
		error: 'must lie within minDb and maxDb',
		path: ['baseDb'],
	});

const phantomSchema = z.strictObject({
	centerMhz: ranged(limits.centerMhz, 'MHz'),
	depthCm: ranged(limits.phantomDepthCm, 'cm'),
	alphaDbPerCmMhz: ranged({min: 0.05, max: 2}, 'dB/cm/MHz'),
	/** Receive mode the reach was measured in; absent = fundamental. */
	receive: receiveSchema.optional(),
});

const referenceSchema = z.strictObject({
	masterGainDb: ranged(limits.masterDb, 'dB'),
	slidersDb: z
		.array(ranged(limits.sliderDb, 'dB'), {error: 'must be a list of slider values in dB'})
		.min(1)
		.max(limits.sliderCount.max),
});

/** Default noise budget: a 3–3.5 MHz probe reaching ~16–20 cm in a 0.5 dB/cm/MHz phantom (from memory). */
export const defaultNoiseBudgetDb = 65;

export const planSchema = z
	.strictObject(
		{
			format: z
				.literal(planFormat, {error: `must be "${planFormat}" (or "evenecho-plan/1", read and migrated)`})
				.default(planFormat),
			name: safeText(
				z
					.string({error: 'must be text of 1 to 80 characters'})
					.min(1, {error: 'must be text of 1 to 80 characters'})
					.max(80, {error: 'must be text of 1 to 80 characters'}),
			).default('Untitled plan'),
			region: safeText(
				z
					.string({error: 'must be text of 1 to 40 characters'})
					.min(1, {error: 'must be text of 1 to 40 characters'})
					.max(40, {error: 'must be text of 1 to 40 characters'}),
			).default('custom'),
			note: safeText(z.string().max(2000, {error: 'must be at most 2000 characters'}), {multiline: true}).optional(),
			layers: z
				.array(layerSchema, {error: `must be a list of ${limits.layers.min} to ${limits.layers.max} layers`})
				.min(limits.layers.min, {error: `must be a list of ${limits.layers.min} to ${limits.layers.max} layers`})
				.max(limits.layers.max, {error: `must be a list of ${limits.layers.min} to ${limits.layers.max} layers`}),
			probe: z.strictObject(
				{
					centerMhz: ranged(limits.centerMhz, 'MHz'),
					bandwidthFraction: ranged(limits.bandwidthFraction).default(0.6),
					/** Skirt steepness of the pulse-echo spectrum; absent = 2, the Gaussian (see README). */
					spectrumSteepness: ranged(limits.spectrumSteepness).optional(),
					/** Absent = fundamental. Older plans' `harmonic` flag is migrated (plan-migration.ts). */
					receive: receiveSchema.optional(),
					/** Beam angle from the layer normal in the first layer, degrees; absent = 0. */
					angleDeg: ranged(limits.angleDeg, '°').optional(),
				},
				{error: 'must be an object with centerMhz'},
			),
			scattererExponent: ranged(limits.scattererExponent).default(0),
			display: z
				.strictObject({
					depthCm: ranged(limits.depthCm, 'cm').default(16),
					assumedSpeedMps: ranged(limits.assumedSpeedMps, 'm/s').default(1540),
				})
				.default({depthCm: 16, assumedSpeedMps: 1540}),
			sliders: sliderSchema.default({
				count: 8,
				minDb: -15,
				maxDb: 15,
				knots: 'band-centres',
				ends: 'flat',
				rampDbPerCmMhz: defaultRampDbPerCmMhz,
			}),
			masterGain: masterSchema.default({minDb: 0, maxDb: 60}),
			noiseBudgetDb: ranged(limits.noiseBudgetDb, 'dB').optional(),
			/** Receive mode `noiseBudgetDb` was stated for; absent = fundamental. */
			noiseBudgetReceive: receiveSchema.optional(),
			phantomCalibration: phantomSchema.optional(),
			/** Depth the exam must reach (the frequency ladder's target); defaults to the display depth. */
			targetDepthCm: ranged(limits.depthCm, 'cm').optional(),
			/**
			 * Instead of `targetDepthCm`: the target as displayed cm below the displayed top of a layer
			 * (1 = the first layer), so it follows the organ when the layers above it change.
			 */
			targetBelowLayer: z
				.strictObject({
					layer: ranged(limits.layers, '', true),
					depthCm: ranged({min: 0, max: limits.depthCm.max}, 'cm'),
				})
				.optional(),
			/** The department's usual settings for this region, against which this plan is shown as deltas. */
			reference: referenceSchema.optional(),
			/** A scanner profile's id (`evenecho scanner list`): its measured depth response, noise budget and slider travel are used. */
			scanner: z
				.string({error: 'must be a scanner profile id (evenecho scanner list)'})
				.regex(/^[a-z0-9][a-z0-9-]{0,63}$/, {
					error:
						'must be a scanner profile id: lower-case letters, digits and hyphens, up to 64 (evenecho scanner list)',
				})
				.optional(),
		},
		{error: 'must be a JSON object'},
	)
	.refine((p) => !(p.noiseBudgetDb !== undefined && p.phantomCalibration !== undefined), {
		error: 'give either noiseBudgetDb or phantomCalibration, not both',
		path: ['phantomCalibration'],
	})
	.refine((p) => !p.reference || p.reference.slidersDb.length === p.sliders.count, {
		error: 'must have one value per slider (sliders.count)',
		path: ['reference', 'slidersDb'],
	})
	.refine((p) => p.targetDepthCm === undefined || withinLimit(p.targetDepthCm, targetDepthLimit(p.display.depthCm)), {
		error: 'must not be deeper than display.depthCm',
		path: ['targetDepthCm'],
	})
	.refine((p) => !(p.targetDepthCm !== undefined && p.targetBelowLayer !== undefined), {
		error: 'give either targetDepthCm or targetBelowLayer, not both',
		path: ['targetBelowLayer'],
	})
	.refine((p) => p.targetBelowLayer === undefined || p.targetBelowLayer.layer <= p.layers.length, {
		error: "must name one of the plan's layers (1 = just under the skin)",
		path: ['targetBelowLayer', 'layer'],
	});

/** A plan as written in a file, with defaults filled in (tissues stay as ids where given so). */
export type PlanDocument = z.output<typeof planSchema>;
export type LayerDocument = PlanDocument['layers'][number];
export type CustomTissue = z.output<typeof customTissueSchema>;

export type ParseResult<T> = {ok: true; value: T} | {ok: false; errors: string[]};

/** Human-readable, one line per problem: `layers.2.thicknessCm: must be a number above 0 and up to 50 cm`. */
export function formatIssues(error: z.ZodError): string[] {
	return error.issues.map((issue) => {
		// Keys and messages can quote the file's own text: shown printable, never raw.
		const path = issue.path.length ? issue.path.map((p) => printable(String(p), 60)).join('.') : '(plan)';
		if (issue.code === 'unrecognized_keys') {
			return `${path}: unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${printable(k, 60)}"`).join(', ')}`;
		}
		return `${path}: ${printable(issue.message, 400)}`;
	});
}

/** Checks a parsed JSON value against the plan format. */
export function parsePlanDocument(input: unknown): ParseResult<PlanDocument> {
	const r = planSchema.safeParse(migratePlanInput(input));
	return r.success ? {ok: true, value: r.data} : {ok: false, errors: formatIssues(r.error)};
}

/** The full tissue record of a layer's tissue (library id or custom). */
export function resolveTissue(t: LayerDocument['tissue']): Tissue {
	if (typeof t === 'string') {
		const found = libraryTissue(t);
		if (!found) throw new Error(`unknown tissue id ${t}`); // unreachable after validation
		return found;
	}
	return {
		...t,
		source: t.source ?? 'custom values entered by the user',
		...(t.nonlinearityBA === undefined
			? {nonlinearitySource: `soft-tissue default ${softTissueNonlinearityBA} (not given)`}
			: {}),
	};
}
