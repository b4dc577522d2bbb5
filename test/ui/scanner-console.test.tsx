/**
 * The measured-scanner panel in the console (key g): measure a session of simulated phantom
 * images, page through the images with the measured region, the grey map, the depth response and
 * penetration, keep the profile, name it in the plan (one undoable edit), and see the sliders as a
 * fraction of the measured travel. The figures shown are the ones the calibration stored; how
 * close those come to the simulator's truth is checked in test/cli/demo-series-calibration.test.ts
 * and test/calibration/recovery.test.ts. Keys are written as a terminal sends them; every wait is
 * for a condition on the frame.
 */
import {mkdtempSync, readdirSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {writeSession} from '../helpers/phantom-session.js';
import {keys} from '../helpers/keys.js';
import {loadScannerConsole, openScannerConsole, type ScannerConsole} from '../helpers/scanner-console.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-scanner-console-'));
afterAll(() => rmSync(root, {recursive: true, force: true}));

let lib: ScannerConsole;
let sessionPath = '';

beforeAll(async () => {
	lib = await loadScannerConsole();
	sessionPath = writeSession(join(root, 'series'), 'png', {seed: 5, width: 200, height: 200}).sessionPath;
}, 60_000);

const open = (home: string, columns?: number, rows?: number) => openScannerConsole(lib, home, columns, rows);

describe('the measured-scanner panel', () => {
	it('measures a session, shows each page, keeps the profile and names it in the plan; u takes it back', async () => {
		const {press, frame, type, waitForText, selectedLine} = lib.press;
		const home = mkdtempSync(join(root, 'home-'));
		const app = await open(home);
		await press(app, 'g');
		await waitForText(app, 'No profiles yet');
		expect(frame(app)).toContain('Measured scanner for this plan');
		expect(selectedLine(app)).toContain('[x] (none) the assumed built-in ramp');

		await press(app, 'c');
		await type(app, sessionPath);
		expect(frame(app)).toContain(`session file or folder: ${sessionPath.slice(0, 20)}`);
		await press(app, keys.enter);
		await waitForText(app, '1/4: images and measured region', 60_000);
		const images = frame(app);
		// One small drawing per image, the measured columns marked on the region's edge.
		for (const name of ['18 dB gain-18', 'in air 36 dB', 'slider 4 +1']) expect(images).toContain(name);
		expect(images).toMatch(/-+:+-+/);
		expect(images).toContain('confirm on the live image');
		// The results page's own keys on the hint line: no Enter there.
		expect(images).toContain('←→ page  s keep  S keep, replacing');
		expect(images).not.toContain('Enter pick');

		await press(app, keys.right);
		expect(frame(app)).toContain('2/4: grey map');
		expect(frame(app)).toMatch(/grey \d+/);
		await press(app, keys.right);
		expect(frame(app)).toContain('3/4: depth response');
		expect(frame(app)).toContain('Replaces the assumed ramp');
		await press(app, 'l');
		const noise = frame(app);
		expect(noise).toContain('4/4: penetration');
		expect(noise).toMatch(/penetration \d+\.\d cm \(v\)/);
		expect(noise).toMatch(/full travel adds \d+\.\d dB/);

		// s asks for the name, offering the session's label.
		await press(app, 's');
		expect(frame(app)).toContain('keep as: Cart B, curved array, abdomen (simulated)_');
		await press(app, keys.enter);
		await waitForText(app, 'Kept the scanner profile');
		const listed = lib.store.openScannerProfileStore(home).list().profiles;
		expect(listed.map((p) => p.id)).toEqual(['cart-b-curved-array-abdomen-simulated']);
		const travel = listed[0]!.sliderTravelDb!;
		expect(selectedLine(app)).toContain('Cart B, curved array, abdomen (simulated)');
		expect(selectedLine(app)).toContain(`travel ${travel.toFixed(1)} dB`);
		expect(frame(app)).toContain('"scanner": "cart-b-curved-array-abdomen-simulated"');

		await press(app, keys.escape);
		expect(frame(app)).not.toContain('Measured scanner');
		await press(app, 'g');
		await waitForText(app, 'Cart B, curved array');
		await press(app, keys.down);
		await press(app, keys.enter);
		await waitForText(app, 'now uses the measured scanner "cart-b-curved-array-abdomen-simulated"');
		expect(frame(app)).toContain('*');

		// The curve step: each slider in dB and as a fraction of the measured travel.
		await press(app, '5');
		const curve = frame(app);
		expect(curve).toContain('comp vs usual travel');
		const rows = curve.split('\n').flatMap((l) => {
			const m = /^>?\s+(\d)\s+\d+\.\d\s+([+\-−]?\d+\.\d)\s+\d+\.\d\s+\S+\s+([+−]?\d\.\d\d)\b/.exec(l);
			return m ? [{sliderDb: Number(m[2]!.replace('−', '-')), fraction: Number(m[3]!.replace('−', '-'))}] : [];
		});
		expect(rows, curve).toHaveLength(8);
		for (const r of rows) expect(r.fraction).toBeCloseTo(r.sliderDb / travel, 1);

		await press(app, 'u');
		expect(frame(app)).not.toContain('comp vs usual travel');
		app.unmount();
	}, 120_000);

	it('builds a session from a folder of DICOM images, one typed line per image, and measures it (truth within the issue ' +
		'tolerances)', async () => {
		const {press, frame, type, waitForText, selectedLine, moveTo} = lib.press;
		const written = writeSession(join(root, 'folder'), 'dicom', {seed: 9, width: 200, height: 200});
		const session = written.session as {
			gainSteps: {image: string; masterGainDb: number}[];
			probeInAir: {image: string; masterGainDb: number};
			sliderSteps: {image: string; slider: number; position: number; masterGainDb: number}[];
		};
		const lineFor = new Map<string, string>([
			...session.gainSteps.map((g) => [g.image, String(g.masterGainDb)] as const),
			[session.probeInAir.image, `air ${session.probeInAir.masterGainDb}`],
			...session.sliderSteps.map((t) => [t.image, `s${t.slider} +${t.position} ${t.masterGainDb}`] as const),
		]);
		const home = mkdtempSync(join(root, 'home-'));
		const app = await open(home);
		await press(app, 'g');
		await waitForText(app, 'No profiles yet');
		await press(app, 'c');
		await type(app, written.dir);
		await press(app, keys.enter);
		await waitForText(app, 'Build a session from');
		// Measuring with too few lines is refused by the session format, naming the field.
		await moveTo(app, keys.down, '[ Measure these ]');
		await press(app, keys.enter);
		expect(frame(app)).toContain('gainSteps: must list at least 3 images');
		for (let i = 0; i < lineFor.size; i++) await press(app, keys.up);
		for (let i = 0; i < lineFor.size; i++) {
			const name = selectedLine(app).trim().split(/\s+/)[1]!;
			await press(app, keys.enter);
			await type(app, lineFor.get(name) ?? '');
			await press(app, keys.enter);
		}
		expect(frame(app)).toContain('probe in air at');
		expect(frame(app)).toContain('slider 4 at +1 of travel');
		expect(selectedLine(app)).toContain('[ Measure these ]');
		await press(app, keys.enter);
		await waitForText(app, '1/4: images and measured region', 60_000);
		await press(app, keys.right, keys.right, keys.right);
		const noise = frame(app);
		const penetration = Number(/penetration (\d+\.\d) cm/.exec(noise)?.[1]);
		const travel = Number(/full travel adds (\d+\.\d) dB/.exec(noise)?.[1]);
		// The tolerances for recovered values: penetration within 1 cm, travel within 1.5 dB.
		expect(Math.abs(penetration - written.series.truth.penetrationCm)).toBeLessThan(1);
		expect(Math.abs(travel - written.series.truth.sliderTravelDb)).toBeLessThan(1.5);
		app.unmount();
	}, 120_000);

	it('a session file that is not there is refused in the panel, naming it; nothing is stored', async () => {
		const {press, frame, type, waitForText} = lib.press;
		const home = mkdtempSync(join(root, 'home-'));
		const app = await open(home, 80, 24);
		await press(app, 'g');
		await waitForText(app, 'No profiles yet');
		await press(app, 'c');
		const missing = join(root, 'no-such-session.json');
		await type(app, missing);
		await press(app, keys.enter);
		await waitForText(app, 'session:', 10_000);
		expect(frame(app)).toContain('session file or folder:');
		expect(readdirSync(home)).not.toContain('scanner-profiles');
		// Esc goes back to the list, and again closes the panel.
		await press(app, keys.escape);
		expect(frame(app)).toContain('Measured scanner for this plan');
		await press(app, keys.escape);
		expect(frame(app)).not.toContain('Measured scanner for this plan');
		app.unmount();
	}, 60_000);
});
