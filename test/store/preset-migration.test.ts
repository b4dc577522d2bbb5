/**
 * Stored record versions: a version-1 record (the earlier flat layout) is migrated on read, left
 * as it is on disk until that preset is written again, and then stored as version 2.
 */
import {readFileSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {currentRecordVersion, decodeRecord, migrateV1, type RecordV1} from '../../src/store/preset-record.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

/** A record as version 1 wrote it. */
const v1Record: RecordV1 = {
	version: 1,
	name: 'Old thyroid',
	saved: '2024-03-01T09:00:00.000Z',
	region: 'neck',
	note: 'Kept from the first store layout.',
	layers: [
		{tissue: 'skin', cm: 0.15},
		{tissue: 'fat', cm: 0.3},
		{tissue: 'soft-tissue', cm: 3},
	],
	probeMhz: 10,
	bandwidth: 0.7,
	depthCm: 4,
	sliders: 6,
	noiseDb: 55,
};

describe('record version 1 → 2', () => {
	it('maps every v1 field to its v2 place', () => {
		expect(migrateV1(v1Record)).toEqual({
			record: 'evenecho-preset',
			version: 2,
			name: 'Old thyroid',
			savedAt: '2024-03-01T09:00:00.000Z',
			plan: {
				format: 'evenecho-plan/2',
				name: 'Old thyroid',
				region: 'neck',
				note: 'Kept from the first store layout.',
				layers: [
					{tissue: 'skin', thicknessCm: 0.15},
					{tissue: 'fat', thicknessCm: 0.3},
					{tissue: 'soft-tissue', thicknessCm: 3},
				],
				probe: {centerMhz: 10, bandwidthFraction: 0.7},
				display: {depthCm: 4},
				sliders: {count: 6},
				noiseBudgetDb: 55,
			},
		});
	});

	it('decodes a v1 record into a full, validated plan with defaults', () => {
		const r = decodeRecord(v1Record);
		expect(r.status).toBe('ok');
		if (r.status !== 'ok') return;
		expect(r.migratedFrom).toBe(1);
		expect(r.plan.sliders).toMatchObject({count: 6, minDb: -15, maxDb: 15, knots: 'band-centres', ends: 'flat'});
		expect(r.plan.display).toEqual({depthCm: 4, assumedSpeedMps: 1540});
		expect(r.plan.noiseBudgetDb).toBe(55);
		// The v1 harmonic flag false migrates to no receive field (fundamental).
		expect(r.plan.probe.receive).toBeUndefined();
	});

	it('keeps the minimal v1 record (no optional fields) working', () => {
		const r = decodeRecord({version: 1, name: 'Bare', layers: [{tissue: 'liver', cm: 10}], probeMhz: 3.5});
		expect(r.status).toBe('ok');
	});

	it('reports a v1 record whose values are out of range, with v2 field names', () => {
		const r = decodeRecord({...v1Record, probeMhz: -3});
		expect(r).toMatchObject({status: 'invalid', name: 'Old thyroid'});
		if (r.status === 'invalid') expect(r.problems.join()).toMatch(/plan\.probe\.centerMhz: must be a number above 0/);
	});

	it('reports a v1 record with an unknown field instead of guessing', () => {
		const r = decodeRecord({...v1Record, gainDb: 3});
		expect(r.status).toBe('invalid');
		if (r.status === 'invalid') expect(r.problems.join()).toMatch(/record version 1: .*unknown field "gainDb"/);
	});

	it('the current version is 2', () => {
		expect(currentRecordVersion).toBe(2);
	});
});

describe('migration in the store', () => {
	function storeWithV1() {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Placeholder', store.get('neck-superficial').plan);
		const file = join(store.presetsDir, 'old-thyroid.json');
		const text = JSON.stringify(v1Record, null, 2);
		writeFileSync(file, text);
		return {store, file, text};
	}

	it('lists and reads a v1 preset, leaving the file as it was', () => {
		const {store, file, text} = storeWithV1();
		const {presets, problems} = store.list();
		expect(problems).toEqual([]);
		expect(presets).toContainEqual({id: 'user:old-thyroid', name: 'Old thyroid', region: 'neck', isTemplate: false});
		const p = store.get('Old thyroid');
		expect(p.migratedFrom).toBe(1);
		expect(p.savedAt).toBe('2024-03-01T09:00:00.000Z');
		expect(p.plan.layers[2]).toEqual({tissue: 'soft-tissue', thicknessCm: 3, thicknessAs: 'true'});
		expect(readFileSync(file, 'utf8')).toBe(text);
	});

	it('writes the current version when the preset is next saved', () => {
		const {store, file} = storeWithV1();
		const p = store.get('Old thyroid');
		store.save('Old thyroid', p.plan, {overwrite: true});
		const record = JSON.parse(readFileSync(file, 'utf8')) as {version: number; plan: unknown};
		expect(record.version).toBe(2);
		expect(record.plan).toEqual(p.plan);
		expect(store.get('Old thyroid').migratedFrom).toBeUndefined();
	});

	it('renaming a v1 preset stores it as v2 under the new name', () => {
		const {store} = storeWithV1();
		const renamed = store.rename('user:old-thyroid', 'Thyroid, old layout');
		const record = JSON.parse(readFileSync(renamed.file, 'utf8')) as {version: number};
		expect(record.version).toBe(2);
	});
});
