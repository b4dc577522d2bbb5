/**
 * Keystroke tests for a template's note after its values change: the exported plan and the console
 * carry the note marked as written for the starting plan before the changes, with the values the
 * plan now has; an unchanged plan keeps the note as the template wrote it. Interface behaviour only.
 */
import {mkdtempSync, readdirSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {noteMarkStart, planWithNote, unmarkedNote} from '../../src/plan/plan-note.js';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {abdomenPlan} from '../helpers/plans.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, type, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

function exportedPlan(dir: string, stem: string) {
	const file = readdirSync(dir).find((f) => f.startsWith(stem) && f.endsWith('.plan.json'));
	if (!file) throw new Error(`no exported plan in ${readdirSync(dir).join(', ')}`);
	return JSON.parse(readFileSync(join(dir, file), 'utf8')) as {note?: string};
}

describe('template notes follow the values', () => {
	it('8 cm of fat over the liver: the exported note is marked, names the template and the values now', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-notes-'));
		const out = mkdtempSync(join(tmpdir(), 'evenecho-notes-out-'));
		dirs.push(home, out);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={out} columns={120} rows={40} />);
		apps.push(app);
		await ready(app);
		await moveTo(app, keys.down, 'Upper abdomen – liver');
		await press(app, keys.enter);
		await waitForText(app, 'Started from "Upper abdomen – liver"');
		// Unchanged: exported as the template wrote it.
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Wrote');
		const before = exportedPlan(out, 'upper-abdomen');
		expect(before.note).toMatch(/^Starting point for an average adult/);
		// 8 cm of fat, typed on the stack's fat row.
		await press(app, keys.enter);
		await type(app, '8');
		await press(app, keys.enter);
		await press(app, '1');
		expect(frame(app)).toContain('Note: [Note written for "Upper abdomen – liver", before your');
		await press(app, 's');
		await type(app, 'Bed 7 fat');
		await press(app, keys.enter);
		await waitForText(app, 'Saved as preset "Bed 7 fat"');
		await press(app, 'e', keys.enter);
		await waitForText(app, 'bed-7-fat');
		const after = exportedPlan(out, 'bed-7-fat');
		expect(after.note).toMatch(
			/^\[Note written for "Upper abdomen – liver", before your changes; this plan now has: .*Fat \(subcutaneous\) 8 cm on screen/,
		);
		expect(after.note).toContain('subcutaneous fat 2 cm and abdominal-wall muscle 1 cm');
		expect(unmarkedNote(after.note!)).toBe(before.note);
	});

	it('a mark is rebuilt, never stacked, and keeps the name it was first written for', () => {
		const start = abdomenPlan({note: 'fat 2 cm, 3.5 MHz'});
		const once = planWithNote({...start, probe: {...start.probe, centerMhz: 2.5}}, {name: 'Upper abdomen', doc: start});
		expect(once.note!.startsWith(noteMarkStart)).toBe(true);
		expect(once.note).toContain('2.5 MHz');
		const saved = {...once, name: 'Bed 7'};
		const twice = planWithNote({...saved, probe: {...saved.probe, centerMhz: 2}}, {name: 'Bed 7', doc: saved});
		expect(twice.note!.split(noteMarkStart)).toHaveLength(2);
		expect(twice.note).toContain('"Upper abdomen"');
		expect(twice.note).toContain('; 2 MHz;');
		expect(unmarkedNote(twice.note!)).toBe('fat 2 cm, 3.5 MHz');
		expect(planWithNote(start, {name: 'x', doc: start})).toBe(start);
	});
});
