/**
 * Building a calibration session in the console from a folder of PNG images: PNG carries no depth
 * scale, so the builder asks once for the folder's cm per pixel and top-row depth (checked by the
 * session format's pixelScale limits) and measures a session with that scale set. The images are
 * the project's own invented demo phantom series, written by `evenecho simulate --kind
 * phantom-series --format png` from the console's own starting plan; the session.json it writes
 * beside them states the scale and each image's settings, which the test types in as a user would.
 * Needs `npm run build` (it runs the built CLI). Every wait is for a condition on the frame.
 */
import {execFileSync} from 'node:child_process';
import {mkdtempSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {keys} from '../helpers/keys.js';
import {loadScannerConsole, openScannerConsole, type ScannerConsole} from '../helpers/scanner-console.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-scanner-png-'));
afterAll(() => rmSync(root, {recursive: true, force: true}));
const folder = join(root, 'phantom');

interface Session {
	gainSteps: {image: string; masterGainDb: number}[];
	probeInAir?: {image: string; masterGainDb: number};
	sliderSteps?: {image: string; slider: number; position: number; masterGainDb: number}[];
	pixelScale: {cmPerPixel: number; topRowCm: number};
}
let session: Session;
let lib: ScannerConsole;

beforeAll(async () => {
	const planPath = join(root, 'plan.json');
	writeFileSync(planPath, JSON.stringify(demoPlan()));
	execFileSync(process.execPath, [
		'dist/bundle/main.js',
		'simulate',
		planPath,
		'--kind',
		'phantom-series',
		'--format',
		'png',
		'--seed',
		'5',
		'--out',
		folder,
	]);
	session = JSON.parse(readFileSync(join(folder, 'session.json'), 'utf8')) as Session;
	lib = await loadScannerConsole();
}, 60_000);

describe('a folder of PNG images in the session builder', () => {
	it("asks for the depth scale once, refuses one outside the format's limits, and measures with it", async () => {
		const {store} = lib;
		const {press, frame, type, waitForText, selectedLine, moveTo} = lib.press;
		const lineFor = new Map<string, string>([
			...session.gainSteps.map((g) => [g.image, String(g.masterGainDb)] as const),
			...(session.probeInAir ? [[session.probeInAir.image, `air ${session.probeInAir.masterGainDb}`] as const] : []),
			...(session.sliderSteps ?? []).map(
				(t) => [t.image, `s${t.slider} ${t.position > 0 ? '+' : ''}${t.position} ${t.masterGainDb}`] as const,
			),
		]);
		const home = mkdtempSync(join(root, 'home-'));
		const app = await openScannerConsole(lib, home);
		await press(app, 'g');
		await waitForText(app, 'No profiles yet');
		await press(app, 'c');
		await type(app, folder);
		await press(app, keys.enter);
		await waitForText(app, 'Build a session from');
		expect(frame(app)).toContain('PNG depth scale');

		for (let i = 0; i < lineFor.size; i++) {
			const name = selectedLine(app).trim().split(/\s+/)[1]!;
			await press(app, keys.enter);
			await type(app, lineFor.get(name) ?? '');
			await press(app, keys.enter);
		}
		// The scale row comes after the images; empty, measuring is refused with how to write it.
		expect(selectedLine(app)).toContain('PNG depth scale');
		await moveTo(app, keys.down, '[ Measure these ]');
		await press(app, keys.enter);
		expect(frame(app)).toContain('pixelScale: write cm per pixel');

		// A scale outside the session format's limits (cm per pixel above 0, at most 1) is refused, naming the field.
		await moveTo(app, keys.up, 'PNG depth scale');
		await press(app, keys.enter);
		await type(app, '0 0');
		await press(app, keys.enter);
		await press(app, keys.enter);
		expect(frame(app)).toContain('pixelScale.cmPerPixel');

		const {cmPerPixel, topRowCm} = session.pixelScale;
		await moveTo(app, keys.up, 'PNG depth scale');
		await press(app, keys.enter, keys.backspace, keys.backspace, keys.backspace);
		await type(app, `${cmPerPixel} ${topRowCm}`);
		await press(app, keys.enter);
		expect(frame(app)).toContain(`${cmPerPixel} cm per pixel, top row at ${topRowCm} cm`);
		expect(selectedLine(app)).toContain('[ Measure these ]');
		await press(app, keys.enter);
		await waitForText(app, '1/4: images and measured region', 60_000);
		await press(app, 's');
		await press(app, keys.enter);
		await waitForText(app, 'Kept the scanner profile');
		const kept = store.openScannerProfileStore(home).list().profiles;
		expect(kept).toHaveLength(1);
		expect(kept[0]!.displayDepthCm).toBeCloseTo(demoPlan().display.depthCm, 0);
		app.unmount();
	}, 180_000);
});
