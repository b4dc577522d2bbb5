/**
 * The scanner-profile store keeps the presets' promises because it is built on the same record
 * folder: exclusive create, whole files only, damaged files moved aside and reported, invalid ones
 * left alone, guarded delete and rename (a rival save landing in between is kept, made exact with
 * the pause points), all-or-nothing imports, and an import killed half way rolled back on the next
 * open. The profiles are invented values that pass the schema; no physics is checked here.
 */
import {spawn} from 'node:child_process';
import {existsSync, readdirSync, readFileSync, symlinkSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {profileFormat, type ScannerProfile} from '../../src/calibration/profile-document.js';
import {
	ScannerProfileStore,
	ScannerStoreError,
	openScannerProfileStore,
	profileBundleFormat,
} from '../../src/store/scanner-profile-store.js';
import {assertBuilt, cleanTempHomes, repoRoot, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

/** An invented profile: a straight grey map, a flat depth response. */
function profile(name: string, id: string, label = 'Invented cart, abdomen'): ScannerProfile {
	return {
		format: profileFormat,
		id,
		name,
		label,
		greyMap: [
			{grey: 0, levelDb: -60},
			{grey: 255, levelDb: 0},
		],
		depthResponse: [
			{depthCm: 1, gainDb: 0},
			{depthCm: 15, gainDb: 0},
		],
		sliderTravelDb: 20,
		noiseFloor: null,
		penetrationCm: 12,
		noiseBudgetDb: 90,
		probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
		displayDepthCm: 16,
		sliderCount: 8,
		phantom: {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540},
		columns: [10, 90],
		sliderSteps: [],
		pixelRatioPenetration: null,
		bands: [],
		rmsResidualDb: 0.5,
		cellAreaPx: 20,
		notes: [],
	};
}

const folderOf = (home: string) => join(home, 'scanner-profiles');
const files = (home: string) => (existsSync(folderOf(home)) ? readdirSync(folderOf(home)).sort() : []);
const bundleOf = (...profiles: ScannerProfile[]) => JSON.stringify({format: profileBundleFormat, profiles});

describe('the scanner-profile store', () => {
	it('saves, lists, gets, renames and deletes; a name is taken only once without replace', () => {
		const home = tempHome();
		const store = new ScannerProfileStore(home);
		expect(store.list()).toEqual({profiles: [], problems: []});
		store.save(profile('Cart A', 'cart-a'), {replace: false});
		expect(store.get('CART a').label).toBe('Invented cart, abdomen');
		expect(() => store.save(profile('Cart A', 'cart-a', 'other'), {replace: false})).toThrow(
			/already exists; use --force/,
		);
		expect(store.get('cart-a').label).toBe('Invented cart, abdomen');
		store.save(profile('Cart A', 'cart-a', 'replaced'), {replace: true});
		expect(store.get('cart-a').label).toBe('replaced');
		expect(store.rename('cart-a', 'Cart B', {replace: false}).id).toBe('cart-b');
		expect(files(home)).toEqual(['cart-b.json']);
		expect(store.delete('Cart B').id).toBe('cart-b');
		expect(files(home)).toEqual([]);
		expect(() => store.get('cart-b')).toThrow(/no scanner profile "cart-b"/);
	});

	it('listing creates nothing; the store folder is made on the first save', () => {
		const home = join(tempHome(), 'not-yet');
		expect(openScannerProfileStore(home).list().profiles).toEqual([]);
		expect(existsSync(home)).toBe(false);
		openScannerProfileStore(home).save(profile('Cart A', 'cart-a'), {replace: false});
		expect(files(home)).toEqual(['cart-a.json']);
	});

	it('moves a file that is not JSON aside and says so; leaves a profile that no longer validates as it is', () => {
		const home = tempHome();
		const store = new ScannerProfileStore(home);
		store.save(profile('Good', 'good'), {replace: false});
		writeFileSync(join(folderOf(home), 'broken.json'), '{"format": ');
		const stale = JSON.stringify({...profile('Stale', 'stale'), penetrationCm: 'deep'});
		writeFileSync(join(folderOf(home), 'stale.json'), stale);
		const listing = new ScannerProfileStore(home).list();
		expect(listing.profiles.map((p) => p.id)).toEqual(['good']);
		expect(listing.problems.join('\n')).toMatch(
			/scanner profile file .*broken\.json was damaged .*kept it as .*broken\.json\.damaged-/,
		);
		expect(listing.problems.join('\n')).toMatch(
			/stale\.json: no longer a valid profile \(penetrationCm: .*\); left untouched/,
		);
		expect(readFileSync(join(folderOf(home), 'stale.json'), 'utf8')).toBe(stale);
		expect(files(home).some((f) => f.startsWith('broken.json.damaged-'))).toBe(true);
	});

	it('a profile folder that is a symbolic link is not followed', () => {
		const home = tempHome();
		const elsewhere = tempHome();
		symlinkSync(elsewhere, folderOf(home));
		const store = new ScannerProfileStore(home);
		expect(store.list().problems.join()).toMatch(/symbolic link, not a real folder/);
		expect(() => store.save(profile('Cart A', 'cart-a'), {replace: false})).toThrow(ScannerStoreError);
		expect(readdirSync(elsewhere)).toEqual([]);
	});

	it('a delete refuses when another process saved the profile after it was read; the newer save is kept', () => {
		const home = tempHome();
		const rival = new ScannerProfileStore(home);
		rival.save(profile('Cart A', 'cart-a'), {replace: false});
		const store = new ScannerProfileStore(home, {
			guarded: (point) =>
				point === 'before-take' && void rival.save(profile('Cart A', 'cart-a', 'newer'), {replace: true}),
		});
		expect(() => store.delete('cart-a')).toThrow(/changed while being deleted .*nothing was deleted/);
		expect(rival.get('cart-a').label).toBe('newer');
	});

	it('a rename keeps a save that lands in between, beside the renamed copy', () => {
		const home = tempHome();
		const rival = new ScannerProfileStore(home);
		rival.save(profile('Cart A', 'cart-a'), {replace: false});
		const store = new ScannerProfileStore(home, {
			guarded: (point) =>
				point === 'before-take' && void rival.save(profile('Cart A', 'cart-a', 'newer'), {replace: true}),
		});
		store.rename('cart-a', 'Cart B', {replace: false});
		expect(files(home)).toEqual(['cart-a.json', 'cart-b.json']);
		expect(rival.get('cart-a').label).toBe('newer');
		expect(store.list().problems.join()).toMatch(/saved again by another process while it was being renamed/);
	});

	it('an import is all or nothing: one taken name, a bad entry or a repeated id writes none of it', () => {
		const home = tempHome();
		const store = new ScannerProfileStore(home);
		store.save(profile('Cart B', 'cart-b'), {replace: false});
		const before = files(home);
		const taken = bundleOf(profile('Cart A', 'cart-a'), profile('Cart B', 'cart-b', 'imported'));
		expect(() => store.importText(taken, 'bundle.json', {replace: false})).toThrow(
			/"cart-b" already exists; use --force to replace; nothing was imported/,
		);
		const bad = bundleOf(profile('Cart A', 'cart-a'), {...profile('Cart C', 'cart-c'), greyMap: []} as ScannerProfile);
		expect(() => store.importText(bad, 'bundle.json', {replace: false})).toThrow(
			/not valid scanner profiles; nothing was imported/,
		);
		expect(() =>
			store.importText(bundleOf(profile('Cart A', 'cart-a'), profile('Cart A', 'cart-a')), 'b.json', {replace: false}),
		).toThrow(/appears twice/);
		expect(files(home)).toEqual(before);
		expect(store.importText(taken, 'bundle.json', {replace: true}).map((p) => p.id)).toEqual(['cart-a', 'cart-b']);
		expect(store.get('cart-b').label).toBe('imported');
	});

	it('an import killed half way is rolled back when the store next opens; the retry succeeds', async () => {
		assertBuilt();
		const home = tempHome();
		new ScannerProfileStore(home).save(profile('Cart A', 'cart-a', 'the original'), {replace: false});
		const bundle = join(tempHome(), 'bundle.json');
		writeFileSync(
			bundle,
			bundleOf(
				profile('Cart A', 'cart-a', 'imported'),
				profile('Cart B', 'cart-b', 'imported'),
				profile('Cart C', 'cart-c', 'imported'),
			),
		);
		const signal = await new Promise<NodeJS.Signals | null>((resolve, reject) => {
			const child = spawn(
				process.execPath,
				[join(repoRoot, 'test', 'fixtures', 'scanner', 'killed-import.mjs'), home, bundle, '1'],
				{stdio: 'ignore', timeout: 20_000},
			);
			child.on('error', reject);
			child.on('exit', (_code, sig) => resolve(sig));
		});
		expect(signal).toBe('SIGKILL');

		const store = new ScannerProfileStore(home);
		expect(store.list().problems.join()).toMatch(/an earlier import of 3 files was interrupted; it was rolled back/);
		expect(files(home)).toEqual(['cart-a.json']);
		expect(store.get('cart-a').label).toBe('the original');
		store.importText(readFileSync(bundle, 'utf8'), bundle, {replace: true});
		expect(files(home)).toEqual(['cart-a.json', 'cart-b.json', 'cart-c.json']);
	});
});
