/**
 * Every screen fits: at 80x24 (one pane, the curve on its own step) and at 100x30 (step and curve
 * side by side), no line is wider than the terminal and the frame leaves the last line free.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {renderToString} from 'ink';
import {render} from 'ink-testing-library';
import {afterAll, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {frame, press, ready, type Rendered} from '../helpers/press.js';

const home = mkdtempSync(join(tmpdir(), 'evenecho-screens-'));
afterAll(() => rmSync(home, {recursive: true, force: true}));

function expectFits(text: string, columns: number, rows: number, what: string) {
	const lines = text.split('\n');
	expect(lines.length, `${what}: ${lines.length} lines`).toBeLessThanOrEqual(rows - 1);
	for (const l of lines) expect(l.trimEnd().length, `${what}: "${l}"`).toBeLessThanOrEqual(columns);
}

async function screens(columns: number, rows: number, check: (app: Rendered, what: string) => void) {
	// A folder of its own per size, so the export writes instead of asking to replace.
	const out = mkdtempSync(join(home, `export-${columns}-`));
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} columns={columns} rows={rows} exportDir={out} />,
	);
	await ready(app);
	const visit: [string, string[]][] = [
		['step 1', []],
		['step 2', ['2']],
		['step 2, layer open', [keys.down, keys.enter]],
		['tissue picker', [keys.enter]],
		['step 3', [keys.escape, '3']],
		['step 3, typing', [keys.enter, '9']],
		['step 3, refusal', ['9', keys.enter]],
		['step 4', [keys.escape, '4']],
		['step 4, on', [keys.enter]],
		['step 5', ['5']],
		['fat sweep', ['f']],
		['fat sweep, deltas, next row', ['d', keys.down]],
		['fat sweep, typing the list', [keys.enter, '0']],
		['fat sweep, list refused', [keys.enter]],
		['fat sweep, export folder', [keys.escape, 'e']],
		['fat sweep, exported', [keys.enter]],
		['fat sweep, 16 rows', [keys.enter, ...'1:16:1', keys.enter, keys.pageDown]],
		['fat sweep, help', ['?']],
		['step 5, back from the sweep', [keys.escape, keys.escape]],
		['warnings', ['w']],
		['help', [keys.escape, '?']],
		['quit question', [keys.escape, 'q']],
	];
	for (const [what, sequence] of visit) {
		if (sequence.length) await press(app, ...sequence);
		check(app, what);
	}
	app.unmount();
}

describe('narrow, 80x24', () => {
	it('fits on every step and overlay, with the caution on each', async () => {
		await screens(80, 24, (app, what) => {
			expectFits(frame(app), 80, 24, what);
			expect(frame(app), what).toContain('Starting point only, not a diagnosis');
		});
	});

	it('shows the curve only on its own step, with a live line elsewhere', async () => {
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} columns={80} rows={24} />);
		await ready(app);
		await press(app, '3');
		expect(frame(app)).not.toContain('* need');
		expect(frame(app)).toContain('Live: master');
		await press(app, '5');
		expect(frame(app)).toContain('* need');
		expect(frame(app)).toContain('# depth slider');
		app.unmount();
	});

	it('renders the first screen at a real 80-column width', () => {
		const text = renderToString(<App shelf={openShelf({home})} theme={plainTheme} columns={80} rows={24} />, {
			columns: 80,
		});
		expectFits(text, 80, 24, 'renderToString');
		expect(text).toContain('[1 Starting plan]');
		expect(text).toContain('Live: master');
	});
});

describe('wide, 100x30', () => {
	it('fits on every step and overlay', async () => {
		await screens(100, 30, (app, what) => {
			expectFits(frame(app), 100, 30, what);
			expect(frame(app), what).toContain('Starting point only, not a diagnosis');
		});
	});

	it('shows the step and the live curve side by side', async () => {
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} columns={100} rows={30} />);
		await ready(app);
		await press(app, '3');
		const line = frame(app)
			.split('\n')
			.find((l) => l.includes('Bandwidth'));
		expect(line).toMatch(/Bandwidth.*\|.*\|/);
		expect(frame(app)).toContain('Live curve');
		app.unmount();
	});
});
