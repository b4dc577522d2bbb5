/**
 * A scanner profile as stored and exported, format `evenecho-scanner-profile/1`. The keys of the
 * issue's contract (id, label, greyMap, depthResponse, sliderTravelDb, noiseFloor, penetrationCm,
 * noiseBudgetDb) come first; the rest records how it was measured. The schema checks imported
 * profiles: bounded lists, finite numbers, known keys only.
 */
import {z} from 'zod';
import type {ScannerResponse} from '../engine/types.js';
import type {ScannerCalibration} from './scanner-calibration.js';

export const profileFormat = 'evenecho-scanner-profile/1';

export const profileCaution =
	'Measured on a phantom at the settings stated: a starting point to confirm on the live ' +
	'image, not a diagnosis. Re-measure when the probe, preset, depth, focus or harmonic ' +
	'mode changes. Receive gain before transmit output (ALARA); local protocols decide.';

const num = z.number({error: 'must be a number'}).refine(Number.isFinite, {error: 'must be a finite number'});
const text = (max: number) =>
	z
		.string({error: `must be text of up to ${max} characters`})
		.max(max, {error: `must be text of up to ${max} characters`});

export const profileSchema = z.strictObject({
	format: z.literal(profileFormat, {error: `must be "${profileFormat}"`}),
	id: z
		.string({error: 'must be a profile id'})
		.regex(/^[a-z0-9][a-z0-9-]{0,63}$/, {error: 'must be lower-case letters, digits and hyphens, up to 64'}),
	name: text(60).min(1, {error: 'must be text of 1 to 60 characters'}),
	label: text(80).min(1, {error: 'must be text of 1 to 80 characters'}),
	greyMap: z
		.array(z.strictObject({grey: num, levelDb: num}), {error: 'must be a list of {grey, levelDb}'})
		.min(2)
		.max(300),
	depthResponse: z
		.array(z.strictObject({depthCm: num, gainDb: num}), {error: 'must be a list of {depthCm, gainDb}'})
		.min(2)
		.max(200),
	sliderTravelDb: num.nullable(),
	noiseFloor: z
		.array(z.strictObject({depthCm: num, levelDb: num}))
		.max(200)
		.nullable(),
	penetrationCm: num.nullable(),
	noiseBudgetDb: num.nullable(),
	savedAt: text(40).optional(),
	probe: z.strictObject({centerMhz: num, bandwidthFraction: num}),
	displayDepthCm: num,
	sliderCount: z.number().int().min(1).max(16),
	phantom: z.strictObject({alphaDbPerCmMhz: num, exponent: num, speedMps: num}),
	columns: z.tuple([num, num]),
	sliderSteps: z
		.array(z.strictObject({slider: num, position: num, knotDepthCm: num, travelDb: num, influenceWidthCm: num}))
		.max(32),
	pixelRatioPenetration: z.strictObject({criterion: text(200), depthCm: num, echoToNoiseDb: num.nullable()}).nullable(),
	bands: z
		.array(z.strictObject({depthCm: num, cells: num, levelDb: num, sdDb: num, echoToNoiseDb: num.nullable()}))
		.max(200),
	rmsResidualDb: num,
	cellAreaPx: num,
	notes: z.array(text(400)).max(20),
	caution: text(600).optional(),
});

export type ScannerProfile = z.output<typeof profileSchema>;

const round = (x: number, digits = 3) => Math.round(x * 10 ** digits) / 10 ** digits;
const finiteOrNull = (x: number | null) => (x === null || !Number.isFinite(x) ? null : round(x));

/** The stored form of a calibration under a name and id. */
export function profileFromCalibration(
	c: ScannerCalibration,
	id: string,
	name: string,
	savedAt?: string,
): ScannerProfile {
	return {
		format: profileFormat,
		id,
		name,
		label: c.label,
		greyMap: c.greyMap.map((p) => ({grey: round(p.grey, 2), levelDb: round(p.levelDb)})),
		depthResponse: c.depthResponse.map((p) => ({depthCm: round(p.depthCm), gainDb: round(p.gainDb)})),
		sliderTravelDb: finiteOrNull(c.sliderTravelDb),
		noiseFloor: c.noiseFloor ? c.noiseFloor.map((p) => ({depthCm: round(p.depthCm), levelDb: round(p.levelDb)})) : null,
		penetrationCm: finiteOrNull(c.penetrationCm),
		noiseBudgetDb: finiteOrNull(c.noiseBudgetDb),
		...(savedAt ? {savedAt} : {}),
		probe: c.probe,
		displayDepthCm: c.displayDepthCm,
		sliderCount: c.sliderCount,
		phantom: c.phantom,
		columns: [c.columns[0], c.columns[1]],
		sliderSteps: c.sliderSteps.map((s) => ({
			...s,
			travelDb: round(s.travelDb),
			influenceWidthCm: round(s.influenceWidthCm),
		})),
		pixelRatioPenetration: c.pixelRatioPenetration
			? {
					criterion: c.pixelRatioPenetration.criterion,
					depthCm: round(c.pixelRatioPenetration.depthCm),
					echoToNoiseDb: finiteOrNull(c.pixelRatioPenetration.echoToNoiseDb),
				}
			: null,
		bands: c.bands.map((b) => ({
			depthCm: b.depthCm,
			cells: Math.round(b.cells),
			levelDb: round(b.levelDb),
			sdDb: round(b.sdDb),
			echoToNoiseDb: b.echoToNoiseDb === null ? null : Number.isFinite(b.echoToNoiseDb) ? round(b.echoToNoiseDb) : -99,
		})),
		rmsResidualDb: round(c.rmsResidualDb),
		cellAreaPx: round(c.cellAreaPx),
		notes: [...c.notes],
		caution: profileCaution,
	};
}

/** What a plan takes from a profile. */
export function scannerResponseOf(p: ScannerProfile): {response: ScannerResponse; noiseBudgetDb: number | null} {
	return {
		response: {
			id: p.id,
			label: p.label,
			depthsCm: p.depthResponse.map((d) => d.depthCm),
			gainDb: p.depthResponse.map((d) => d.gainDb),
			sliderTravelDb: p.sliderTravelDb,
			centerMhz: p.probe.centerMhz,
			displayDepthCm: p.displayDepthCm,
			sliderCount: p.sliderCount,
		},
		noiseBudgetDb: p.noiseBudgetDb,
	};
}

/** Checks a profile read from a file or an import; messages name the field path. */
export function parseProfile(value: unknown): {ok: true; value: ScannerProfile} | {ok: false; errors: string[]} {
	const r = profileSchema.safeParse(value);
	if (r.success) {
		const depths = r.data.depthResponse.map((d) => d.depthCm);
		if (depths.some((d, i) => i > 0 && d <= depths[i - 1]!))
			return {ok: false, errors: ['depthResponse: depths must increase']};
		return {ok: true, value: r.data};
	}
	return {
		ok: false,
		errors: r.error.issues.map((i) => `${i.path.length ? i.path.map(String).join('.') : '(profile)'}: ${i.message}`),
	};
}
