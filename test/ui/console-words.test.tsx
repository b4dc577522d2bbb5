/**
 * Keystroke tests for one vocabulary: the slider knots and ends read in the console with the words
 * the plan file, the text summary and the README use (`band-centres`/`band-edges`, `flat`/`extrapolate`).
 * Interface wording only; no physics is asserted.
 */
import {mkdtempSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {curveSummary} from '../../src/report/curve-summary.js';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {choiceFields} from '../../src/ui/state/plan-fields.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, selectedLine, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

describe('one vocabulary for the slider bank', () => {
	it('step 3 shows the file words, Enter switches them, and the summary says the same', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-words-'));
		dirs.push(home);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={80} rows={24} />);
		apps.push(app);
		await ready(app);
		await press(app, '3');
		await moveTo(app, keys.down, 'Slider knots');
		expect(selectedLine(app)).toContain('band-centres');
		await press(app, keys.enter);
		expect(selectedLine(app)).toContain('band-edges');
		await moveTo(app, keys.down, 'Slider ends');
		expect(selectedLine(app)).toContain('flat');
		expect(frame(app)).not.toMatch(/mid-band|held level/);
		expect(curveSummary(computeCurve(resolvePlan(demoPlan())))).toContain('at band-centres, flat ends');
	});

	it('every option starts with its value in the plan file, and the README names the same values', () => {
		for (const field of [choiceFields.knots, choiceFields.ends])
			for (const o of field.options) expect(o.text.startsWith(o.value)).toBe(true);
		const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
		for (const word of ['`band-centres`', '`band-edges`', '`flat`', '`extrapolate`']) expect(readme).toContain(word);
	});
});

describe('a preset named like a template', () => {
	it('is marked "(your preset)" beside the "(template)" on step 1, and the Now line says which one is open', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-twin-'));
		dirs.push(home);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={120} rows={30} />);
		apps.push(app);
		await ready(app);
		await moveTo(app, keys.down, 'Upper abdomen – liver');
		await press(app, keys.enter);
		await waitForText(app, 'Started from "Upper abdomen – liver"');
		await press(app, '+', 's', keys.enter);
		expect(frame(app)).toContain('Step 1 marks it "(your preset)" beside the template');
		await press(app, '1');
		expect(frame(app)).toMatch(/Upper abdomen – liver \(template\) +template/);
		expect(frame(app)).toMatch(/Upper abdomen – liver \(your preset\) +saved/);
		expect(frame(app)).toContain('Now: "Upper abdomen – liver" (your preset)');
		// Names that are not shared stay as they are.
		expect(frame(app)).toMatch(/Pelvis – through a full bladder +template/);
	});
});
