/**
 * The stored form of one user preset (one file each) and how older forms are read.
 *
 * Record version 2 (current) wraps a plan document in the plan format:
 *
 *     {"record": "evenecho-preset", "version": 2, "name": "…", "savedAt": "ISO time", "plan": {…}}
 *
 * Record version 1 is the first, flatter layout: no record marker and no plan format; the probe and
 * display settings sat at the top level, layer thickness was `cm`, the slider bank was just a count
 * and the noise budget a flat `noiseDb`. It is defined here so the migration path exists, and is
 * tested, before a real migration is ever needed; v1 records are migrated on read and rewritten as
 * v2 the next time that preset is saved.
 */
import {z} from 'zod';
import {safeText} from '../files/text-field.js';
import {formatIssues, parsePlanDocument, planFormat, type PlanDocument} from '../plan/plan-schema.js';
import {checkPresetName} from './safe-name.js';
import {PresetStoreError} from './store-errors.js';

/** The `record` field that marks a stored preset (from version 2 on). */
export const recordMarker = 'evenecho-preset';
/** The record version this program writes; older ones are migrated on read. */
export const currentRecordVersion = 2;

const recordV2Schema = z.strictObject({
	record: z.literal(recordMarker, {error: `must be "${recordMarker}"`}),
	version: z.literal(currentRecordVersion),
	name: z.string({error: 'must be the preset name'}),
	savedAt: safeText(z.string().max(40, {error: 'must be an ISO time'})).optional(),
	plan: z.unknown(),
});

/** The v1 layout; values are checked after migration, by the plan schema, with v2 field names. */
const recordV1Schema = z.strictObject({
	version: z.literal(1),
	name: z.string({error: 'must be the preset name'}),
	saved: z.string().max(40).optional(),
	region: z.unknown().optional(),
	note: z.unknown().optional(),
	layers: z.array(z.strictObject({tissue: z.unknown(), cm: z.unknown()}), {error: 'must be a list of layers'}),
	probeMhz: z.unknown(),
	bandwidth: z.unknown().optional(),
	harmonic: z.unknown().optional(),
	depthCm: z.unknown().optional(),
	sliders: z.unknown().optional(),
	noiseDb: z.unknown().optional(),
});

/** A version-1 record, as checked before migration. */
export type RecordV1 = z.output<typeof recordV1Schema>;

/** What reading one stored record gave. `invalid` records are reported and left as they are. */
export type DecodedRecord =
	| {status: 'ok'; name: string; plan: PlanDocument; savedAt?: string; migratedFrom?: number}
	| {status: 'invalid'; name?: string; problems: string[]};

/** Turns a v1 record into the raw v2 shape (not yet validated). Pure, so it is easy to test. */
export function migrateV1(v1: RecordV1): {
	record: string;
	version: number;
	name: string;
	savedAt?: string;
	plan: Record<string, unknown>;
} {
	const plan: Record<string, unknown> = {
		format: planFormat,
		name: v1.name,
		layers: v1.layers.map((l) => ({tissue: l.tissue, thicknessCm: l.cm})),
		probe: {
			centerMhz: v1.probeMhz,
			...(v1.bandwidth !== undefined ? {bandwidthFraction: v1.bandwidth} : {}),
			...(v1.harmonic !== undefined ? {harmonic: v1.harmonic} : {}),
		},
	};
	if (v1.region !== undefined) plan['region'] = v1.region;
	if (v1.note !== undefined) plan['note'] = v1.note;
	if (v1.depthCm !== undefined) plan['display'] = {depthCm: v1.depthCm};
	if (v1.sliders !== undefined) plan['sliders'] = {count: v1.sliders};
	if (v1.noiseDb !== undefined) plan['noiseBudgetDb'] = v1.noiseDb;
	return {
		record: recordMarker,
		version: currentRecordVersion,
		name: v1.name,
		...(v1.saved !== undefined ? {savedAt: v1.saved} : {}),
		plan,
	};
}

function versionOf(value: unknown): unknown {
	return value !== null && typeof value === 'object' && !Array.isArray(value)
		? (value as Record<string, unknown>)['version']
		: undefined;
}

function nameOf(value: unknown): string | undefined {
	const name = value !== null && typeof value === 'object' ? (value as Record<string, unknown>)['name'] : undefined;
	return typeof name === 'string' ? name : undefined;
}

/** Reads a parsed record of any known version; never throws. */
export function decodeRecord(value: unknown): DecodedRecord {
	const version = versionOf(value);
	const name = nameOf(value);
	const withName = (problems: string[]): DecodedRecord => ({
		status: 'invalid',
		...(name !== undefined ? {name} : {}),
		problems,
	});
	if (typeof version === 'number' && Number.isInteger(version) && version > currentRecordVersion) {
		return withName([
			`written by a newer evenecho (record version ${version}; this one reads up to ${currentRecordVersion}); left unchanged`,
		]);
	}
	let migratedFrom: number | undefined;
	let raw: unknown = value;
	if (version === 1) {
		const v1 = recordV1Schema.safeParse(value);
		if (!v1.success) return withName(formatIssues(v1.error).map((p) => `record version 1: ${p}`));
		raw = migrateV1(v1.data);
		migratedFrom = 1;
	}
	const record = recordV2Schema.safeParse(raw);
	if (!record.success) return withName(formatIssues(record.error).map((p) => p.replace(/^\(plan\)/, '(record)')));
	let checkedName: string;
	try {
		checkedName = checkPresetName(record.data.name);
	} catch (error) {
		if (error instanceof PresetStoreError) return withName([error.message]);
		throw error;
	}
	const plan = parsePlanDocument(record.data.plan);
	if (!plan.ok) return withName(plan.errors.map((e) => `plan.${e}`));
	return {
		status: 'ok',
		name: checkedName,
		plan: {...plan.value, name: checkedName},
		...(record.data.savedAt !== undefined ? {savedAt: record.data.savedAt} : {}),
		...(migratedFrom !== undefined ? {migratedFrom} : {}),
	};
}

/** The text of a current-version record; the plan takes the preset's name. */
export function encodeRecord(name: string, plan: PlanDocument, savedAt: Date = new Date()): string {
	const record = {
		record: recordMarker,
		version: currentRecordVersion,
		name,
		savedAt: savedAt.toISOString(),
		plan: {...plan, name},
	};
	return JSON.stringify(record, null, 2) + '\n';
}
