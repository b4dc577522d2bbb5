/**
 * Keystroke tests for two plans side by side (v): this patient beside the plan it started from,
 * curve and slider table each, and the change line under both. The change is this plan's fit
 * minus the other's, so it must equal the difference of the two slider tables shown.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, type, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

describe('two plans side by side', () => {
	for (const [columns, rows] of [
		[120, 40],
		[80, 24],
	] as const) {
		it(`8 cm of fat beside the upper-abdomen template at ${columns}×${rows}`, async () => {
			const home = mkdtempSync(join(tmpdir(), 'evenecho-compare-'));
			dirs.push(home);
			const app = render(
				<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={columns} rows={rows} />,
			);
			apps.push(app);
			await ready(app);
			await moveTo(app, keys.down, 'Upper abdomen – liver');
			await press(app, keys.enter);
			await waitForText(app, 'Started from');
			await press(app, keys.enter);
			await type(app, '8');
			await press(app, keys.enter, 'v');
			const f = frame(app);
			expect(f).toContain('This patient: Upper abdomen');
			expect(f).toContain('Starting plan (←→): Upper abdomen');
			const change = /master ([+-]\d+\.\d) dB; sliders ((?:[+-]\d+\.\d ?)+)/.exec(f);
			expect(change, f).not.toBeNull();
			// Each table row: "#  depth  slider  comp  vs"; the two columns are this patient and the template.
			const tableRows = f.split('\n').filter((l) => /^\s+1\s+\d+\.\d\s+[+-]\d+\.\d/.test(l));
			expect(tableRows).toHaveLength(1);
			const [left, right] = [...tableRows[0]!.matchAll(/\s1\s+\d+\.\d\s+([+-]\d+\.\d)/g)].map((m) => Number(m[1]));
			expect(Number(change![2]!.trim().split(' ')[0])).toBeCloseTo(left! - right!, 0);
			for (const line of f.split('\n')) expect(line.length).toBeLessThanOrEqual(columns);
			// Both tables whole: each header once per side, every slider row on both sides.
			expect(f.split('\n').filter((l) => (l.match(/# depth slider/g) ?? []).length === 2)).toHaveLength(1);
			expect(
				f.split('\n').filter((l) => /^\s+8\s+\d+\.\d\s+[+-]\d+\.\d.*\s8\s+\d+\.\d\s+[+-]\d+\.\d/.test(l)),
			).toHaveLength(1);
			await press(app, keys.escape);
			expect(frame(app)).not.toContain('Starting plan (←→)');
		});
	}

	it('← → put a saved preset (or any template) on the right instead', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-compare-'));
		dirs.push(home);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={120} rows={40} />);
		apps.push(app);
		await ready(app);
		await press(app, '2', keys.enter);
		await type(app, '3');
		await press(app, keys.enter, 's');
		await type(app, 'Usual Ward Heron');
		await press(app, keys.enter);
		await waitForText(app, 'Saved as preset "Usual Ward Heron"');
		await press(app, keys.enter);
		await type(app, '7');
		await press(app, keys.enter, 'v');
		expect(frame(app)).toContain('Starting plan (←→): Built-in demo');
		// The list ends with the saved presets: one step back from the starting plan.
		await press(app, keys.left);
		await waitForText(app, 'Saved preset (←→): Usual Ward Heron');
		expect(frame(app)).toMatch(/This patient minus the other: master [+-]\d/);
		await press(app, keys.right);
		expect(frame(app)).toContain('Starting plan (←→): Built-in demo');
		await press(app, keys.right);
		await waitForText(app, 'Built-in demo (←→)');
		await press(app, keys.right);
		await waitForText(app, 'Template (←→): Breast');
	});
});
