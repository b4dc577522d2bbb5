/**
 * `evenecho` with no arguments when stdout is not a terminal (piped, CI): no raw mode, the demo
 * plan's summary, and how to open the console. Runs the built CLI (`npm test` builds first).
 */
import {cliPath} from '../helpers/run-cli.js';
import {spawnSync} from 'node:child_process';
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, describe, expect, it} from 'vitest';
import {canOpenConsole} from '../../src/ui/open-console.js';

const cli = cliPath;
const home = mkdtempSync(join(tmpdir(), 'evenecho-pipe-'));
afterAll(() => rmSync(home, {recursive: true, force: true}));

function run(env: Record<string, string>) {
	const {CI: _ci, ...rest} = process.env;
	return spawnSync(process.execPath, [cli], {
		encoding: 'utf8',
		input: '',
		env: {...rest, EVENECHO_HOME: home, ...env},
		timeout: 20_000,
	});
}

describe('evenecho piped', () => {
	it('prints the demo summary and how to open the console, without raw mode', () => {
		const r = run({});
		expect(r.status).toBe(0);
		expect(r.stdout).toContain('Demo – deep liver through thick fat');
		expect(r.stdout).toContain('Depth-gain starting point');
		expect(r.stdout).toContain('Cautions');
		expect(r.stdout).toContain('run `evenecho` in a terminal');
		expect(r.stderr).not.toMatch(/raw mode/i);
		expect(r.stdout).not.toMatch(/\u001B\[\?1049h/);
	});

	it('does the same in CI even on a terminal', () => {
		expect(canOpenConsole({isTTY: true}, {isTTY: true}, {CI: 'true'})).toBe(false);
		expect(canOpenConsole({isTTY: true}, {isTTY: true}, {CI: 'false'})).toBe(true);
		expect(canOpenConsole({isTTY: true}, {isTTY: false}, {})).toBe(false);
		expect(canOpenConsole({isTTY: false}, {isTTY: true}, {})).toBe(false);
	});
});
