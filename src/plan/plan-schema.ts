/**
 * The plan file format `evenecho-plan/2` (JSON): one patient/exam setup. This is the boundary
 * where outside input is checked; the engine behind it trusts what it gets. Files in the older
 * `evenecho-plan/1` are read through {@link migratePlanV1} (plan-migration.ts) and keep their meaning.
 *
 * Every field but `layers` and `probe.centerMhz` has a default. Unknown keys are refused, and every
 * message names the field path and the allowed range.
 */
import {z} from 'zod/mini';
import {softTissueNonlinearityBA} from '../engine/nonlinearity.js';
import {printable} from '../files/printable.js';
import {safeText} from '../files/text-field.js';
import {libraryTissue, tissueIds} from '../engine/tissue-library.js';
import type {Tissue} from '../engine/types.js';
import {migratePlanInput} from './plan-migration.js';

// Each command parses a handful of documents: zod's compiled object parsers (built with new Function
// on first use) cost more to build than they save here. Global, set where the schemas are built.
z.config({jitless: true});
// zod/mini (the same checks, without a method set on every schema) comes without messages for the
// few checks here that name none; classic zod, loaded by other commands, sets the same ones.
z.config(z.locales.en());

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
	const low = l.exclusiveMin ? z.gt(l.min, {error: message}) : z.gte(l.min, {error: message});
	const high = z.lte(l.max, {error: message});
	return (integer ? z.int({error: message}) : z.number({error: message})).check(low, high);
}

/** Text of 1 to `max` characters, one line, the same message for every way it can be wrong. */
function shortText(max: number) {
	const message = `must be text of 1 to ${max} characters`;
	return safeText(
		z.string({error: message}).check(z.minLength(1, {error: message}), z.maxLength(max, {error: message})),
	);
}

const customTissueSchema = z.strictObject({
	label: shortText(60),
	speedMps: ranged(limits.speedMps, 'm/s'),
	densityKgM3: ranged(limits.densityKgM3, 'kg/m³'),
	alphaDbPerCmMhz: ranged(limits.alphaDbPerCmMhz, 'dB/cm/MHz^n'),
	exponent: ranged(limits.exponent),
	/** Acoustic nonlinearity B/A (tissue harmonic); absent = the soft-tissue default. */
	nonlinearityBA: z.optional(ranged(limits.nonlinearityBA)),
	source: z.optional(safeText(z.string().check(z.maxLength(300, {error: 'must be at most 300 characters'})))),
});

/** What the probe receives (see ReceiveMode in the engine). */
export const receiveModes = ['fundamental', 'tissue-harmonic', 'scatterer-harmonic'] as const;
const receiveSchema = z.enum(receiveModes, {error: 'must be "fundamental", "tissue-harmonic" or "scatterer-harmonic"'});

const tissueIdSchema = z.string({error: 'must be a library tissue id or a custom tissue object'}).check(
	z.refine((id: string) => libraryTissue(id) !== undefined, {
		error: (issue) => `unknown tissue id "${printable(String(issue.input), 60)}"; known ids: ${tissueIds.join(', ')}`,
	}),
);

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
	.check(
		z.refine(
			(m: {alphaDbPerCmMhz: number; lowDbPerCmMhz: number; highDbPerCmMhz: number}) =>
				m.lowDbPerCmMhz <= m.alphaDbPerCmMhz && m.alphaDbPerCmMhz <= m.highDbPerCmMhz,
			{
				error: 'the interval must hold the value: lowDbPerCmMhz ≤ alphaDbPerCmMhz ≤ highDbPerCmMhz',
				path: ['alphaDbPerCmMhz'],
			},
		),
	);

/** `true`: physical thickness; `displayed`: as measured on the screen (converted through the assumed speed). */
export const thicknessModes = ['true', 'displayed'] as const;
export type ThicknessMode = (typeof thicknessModes)[number];

export const layerSchema = z.strictObject({
	tissue: z.union([tissueIdSchema, customTissueSchema], {
		error: 'must be a library tissue id or a custom tissue object',
	}),
	thicknessCm: ranged(limits.thicknessCm, 'cm'),
	thicknessAs: z._default(z.enum(thicknessModes, {error: 'must be "true" or "displayed"'}), 'true'),
	measuredAlpha: z.optional(measuredAlphaSchema),
});

const sliderSchema = z
	.strictObject({
		count: z._default(ranged(limits.sliderCount, '', true), 8),
		minDb: z._default(ranged(limits.sliderDb, 'dB'), -15),
		maxDb: z._default(ranged(limits.sliderDb, 'dB'), 15),
		knots: z._default(
			z.enum(['band-centres', 'band-edges'], {error: 'must be "band-centres" or "band-edges"'}),
			'band-centres',
		),
		ends: z._default(z.enum(['flat', 'extrapolate'], {error: 'must be "flat" or "extrapolate"'}), 'flat'),
		rampDbPerCmMhz: z._default(ranged(limits.rampDbPerCmMhz, 'dB/cm/MHz'), defaultRampDbPerCmMhz),
	})
	.check(
		z.refine((s: {minDb: number; maxDb: number}) => s.minDb < s.maxDb, {
			error: 'minDb must be below maxDb',
			path: ['maxDb'],
		}),
	);

const masterSchema = z
	.strictObject({
		minDb: z._default(ranged(limits.masterDb, 'dB'), 0),
		maxDb: z._default(ranged(limits.masterDb, 'dB'), 60),
		/** Master gain showing the tissue under the skin right with sliders centred; default mid-range. */
		baseDb: z.optional(ranged(limits.masterDb, 'dB')),
	})
	.check(
		z.refine((m: {minDb: number; maxDb: number}) => m.minDb < m.maxDb, {
			error: 'minDb must be below maxDb',
			path: ['maxDb'],
		}),
		z.refine(
			(m: {minDb: number; maxDb: number; baseDb?: number | undefined}) =>
				m.baseDb === undefined || (m.baseDb >= m.minDb && m.baseDb <= m.maxDb),
			{error: 'must lie within minDb and maxDb', path: ['baseDb']},
		),
	);

const phantomSchema = z.strictObject({
	centerMhz: ranged(limits.centerMhz, 'MHz'),
	depthCm: ranged(limits.phantomDepthCm, 'cm'),
	alphaDbPerCmMhz: ranged({min: 0.05, max: 2}, 'dB/cm/MHz'),
	/** Receive mode the reach was measured in; absent = fundamental. */
	receive: z.optional(receiveSchema),
});

const referenceSchema = z.strictObject({
	masterGainDb: ranged(limits.masterDb, 'dB'),
	slidersDb: z
		.array(ranged(limits.sliderDb, 'dB'), {error: 'must be a list of slider values in dB'})
		.check(z.minLength(1), z.maxLength(limits.sliderCount.max)),
});

/** Default noise budget: a 3–3.5 MHz probe reaching ~16–20 cm in a 0.5 dB/cm/MHz phantom (from memory). */
export const defaultNoiseBudgetDb = 65;

const layersMessage = `must be a list of ${limits.layers.min} to ${limits.layers.max} layers`;

const planShape = z.strictObject(
	{
		format: z._default(
			z.literal(planFormat, {error: `must be "${planFormat}" (or "evenecho-plan/1", read and migrated)`}),
			planFormat,
		),
		name: z._default(shortText(80), 'Untitled plan'),
		region: z._default(shortText(40), 'custom'),
		note: z.optional(
			safeText(z.string().check(z.maxLength(2000, {error: 'must be at most 2000 characters'})), {multiline: true}),
		),
		layers: z
			.array(layerSchema, {error: layersMessage})
			.check(
				z.minLength(limits.layers.min, {error: layersMessage}),
				z.maxLength(limits.layers.max, {error: layersMessage}),
			),
		probe: z.strictObject(
			{
				centerMhz: ranged(limits.centerMhz, 'MHz'),
				bandwidthFraction: z._default(ranged(limits.bandwidthFraction), 0.6),
				/** Skirt steepness of the pulse-echo spectrum; absent = 2, the Gaussian (see README). */
				spectrumSteepness: z.optional(ranged(limits.spectrumSteepness)),
				/** Absent = fundamental. Older plans' `harmonic` flag is migrated (plan-migration.ts). */
				receive: z.optional(receiveSchema),
				/** Beam angle from the layer normal in the first layer, degrees; absent = 0. */
				angleDeg: z.optional(ranged(limits.angleDeg, '°')),
			},
			{error: 'must be an object with centerMhz'},
		),
		scattererExponent: z._default(ranged(limits.scattererExponent), 0),
		display: z._default(
			z.strictObject({
				depthCm: z._default(ranged(limits.depthCm, 'cm'), 16),
				assumedSpeedMps: z._default(ranged(limits.assumedSpeedMps, 'm/s'), 1540),
			}),
			{depthCm: 16, assumedSpeedMps: 1540},
		),
		sliders: z._default(sliderSchema, {
			count: 8,
			minDb: -15,
			maxDb: 15,
			knots: 'band-centres',
			ends: 'flat',
			rampDbPerCmMhz: defaultRampDbPerCmMhz,
		}),
		masterGain: z._default(masterSchema, {minDb: 0, maxDb: 60}),
		noiseBudgetDb: z.optional(ranged(limits.noiseBudgetDb, 'dB')),
		/** Receive mode `noiseBudgetDb` was stated for; absent = fundamental. */
		noiseBudgetReceive: z.optional(receiveSchema),
		phantomCalibration: z.optional(phantomSchema),
		/** Depth the exam must reach (the frequency ladder's target); defaults to the display depth. */
		targetDepthCm: z.optional(ranged(limits.depthCm, 'cm')),
		/**
		 * Instead of `targetDepthCm`: the target as displayed cm below the displayed top of a layer
		 * (1 = the first layer), so it follows the organ when the layers above it change.
		 */
		targetBelowLayer: z.optional(
			z.strictObject({
				layer: ranged(limits.layers, '', true),
				depthCm: ranged({min: 0, max: limits.depthCm.max}, 'cm'),
			}),
		),
		/** The department's usual settings for this region, against which this plan is shown as deltas. */
		reference: z.optional(referenceSchema),
		/** A scanner profile's id (`evenecho scanner list`): its measured depth response, noise budget and slider travel are used. */
		scanner: z.optional(
			z.string({error: 'must be a scanner profile id (evenecho scanner list)'}).check(
				z.regex(/^[a-z0-9][a-z0-9-]{0,63}$/, {
					error:
						'must be a scanner profile id: lower-case letters, digits and hyphens, up to 64 (evenecho scanner list)',
				}),
			),
		),
	},
	{error: 'must be a JSON object'},
);

type PlanShape = z.output<typeof planShape>;

export const planSchema = planShape.check(
	z.refine((p: PlanShape) => !(p.noiseBudgetDb !== undefined && p.phantomCalibration !== undefined), {
		error: 'give either noiseBudgetDb or phantomCalibration, not both',
		path: ['phantomCalibration'],
	}),
	z.refine((p: PlanShape) => !p.reference || p.reference.slidersDb.length === p.sliders.count, {
		error: 'must have one value per slider (sliders.count)',
		path: ['reference', 'slidersDb'],
	}),
	z.refine(
		(p: PlanShape) =>
			p.targetDepthCm === undefined || withinLimit(p.targetDepthCm, targetDepthLimit(p.display.depthCm)),
		{error: 'must not be deeper than display.depthCm', path: ['targetDepthCm']},
	),
	z.refine((p: PlanShape) => !(p.targetDepthCm !== undefined && p.targetBelowLayer !== undefined), {
		error: 'give either targetDepthCm or targetBelowLayer, not both',
		path: ['targetBelowLayer'],
	}),
	z.refine((p: PlanShape) => p.targetBelowLayer === undefined || p.targetBelowLayer.layer <= p.layers.length, {
		error: "must name one of the plan's layers (1 = just under the skin)",
		path: ['targetBelowLayer', 'layer'],
	}),
);

/** A plan as written in a file, with defaults filled in (tissues stay as ids where given so). */
export type PlanDocument = z.output<typeof planSchema>;
export type LayerDocument = PlanDocument['layers'][number];
export type CustomTissue = z.output<typeof customTissueSchema>;

export type ParseResult<T> = {ok: true; value: T} | {ok: false; errors: string[]};

/** Human-readable, one line per problem: `layers.2.thicknessCm: must be a number above 0 and up to 50 cm`. */
export function formatIssues(error: z.core.$ZodError): string[] {
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
