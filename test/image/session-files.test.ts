/**
 * A whole session read from files as a user exports them: DICOM (MONOCHROME2 and RGB mixed, a
 * border, burned-in text, a colour marker) and PNG (grey and RGB mixed). The depth scale comes from
 * the ultrasound region (DICOM) or pixelScale (PNG); the recovered figures meet the tolerances.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, describe, expect, it} from 'vitest';
import {calibrateScanner} from '../../src/calibration/scanner-calibration.js';
import {loadSession} from '../../src/image/load-session.js';
import {writeSession} from '../helpers/phantom-session.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-session-'));
afterAll(() => rmSync(root, {recursive: true, force: true}));

function worstAfterOffset(pairs: Array<[number, number]>): number {
	const c = pairs.reduce((s, [a, b]) => s + a - b, 0) / pairs.length;
	return Math.max(...pairs.map(([a, b]) => Math.abs(a - b - c)));
}

describe.each(['dicom', 'png'] as const)('a %s session', (format) => {
	it.each([
		{seed: 5, gamma: 1, smoothPx: 0},
		{seed: 73, gamma: 0.7, smoothPx: 1},
	])('seed $seed, γ $gamma, smoothing $smoothPx: within tolerance', (options) => {
		const written = writeSession(join(root, `${format}-${options.seed}`), format, options);
		const loaded = loadSession(written.sessionPath);
		const first = loaded.input.gainSteps[0]!.image;
		expect(first.depthScaleFrom).toBe(format === 'dicom' ? 'ultrasound-region' : 'pixel-scale');
		expect(loaded.input.gainSteps[1]!.image.notes.join(' ')).toContain('coloured pixels masked');
		const cal = calibrateScanner(loaded.input);
		const t = written.series.truth;
		const grey = cal.greyMap.filter((p) => p.grey >= 30 && p.grey <= 220);
		const greyErr = worstAfterOffset(grey.map((p) => [p.levelDb, t.levelAtMeanGrey(p.grey)]));
		const depthErr = worstAfterOffset(cal.depthResponse.map((p) => [p.gainDb, t.depthResponse(p.depthCm)]));
		console.log(
			`${format} seed ${options.seed} γ ${options.gamma}: grey ${greyErr.toFixed(2)} dB, depth ` +
				`${depthErr.toFixed(2)} dB, travel ${cal.sliderTravelDb!.toFixed(2)}/${t.sliderTravelDb}, ` +
				`penetration ${cal.penetrationCm!.toFixed(2)}/${t.penetrationCm.toFixed(2)} cm`,
		);
		expect(greyErr).toBeLessThanOrEqual(1.5);
		expect(depthErr).toBeLessThanOrEqual(1.5);
		expect(Math.abs(cal.sliderTravelDb! - t.sliderTravelDb)).toBeLessThanOrEqual(1.5);
		expect(Math.abs(cal.penetrationCm! - t.penetrationCm)).toBeLessThanOrEqual(1);
	});
});
