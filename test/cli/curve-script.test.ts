/**
 * The precompiled curve script (dist/bundle/curve-script.cjs with V8's code cache beside it, see
 * src/runtime/precompiled-script.ts): `curve` prints exactly what it prints from the modules, the
 * build's cache is one this Node accepts, a start only reads the bundle folder, and a missing or
 * unusable cache changes nothing but the speed. (Checks of the build itself: no outside source.)
 */
import {spawnSync} from 'node:child_process';
import {cpSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync} from 'node:fs';
import {dirname, join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {codeCachePath, compileScript} from '../../src/runtime/precompiled-script.js';
import {cliPath} from '../helpers/run-cli.js';
import {cleanTempHomes, repoRoot, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

const bundle = dirname(cliPath);
const scriptPath = join(bundle, 'curve-script.cjs');
const preset = (name: string) => join(repoRoot, 'presets', `${name}.json`);

function run(main: string, args: readonly string[], input = '') {
	const r = spawnSync(process.execPath, [main, ...args], {
		input,
		encoding: 'utf8',
		env: {...process.env, EVENECHO_HOME: tempHome(), EVENECHO_DEBUG: ''},
		timeout: 60_000,
	});
	return {status: r.status, stdout: r.stdout, stderr: r.stderr};
}

/** A copy of the bundle folder; `cache` replaces the code cache's bytes, or removes the script. */
function bundleCopy(cache: Buffer | 'no cache' | 'no script'): string {
	const dir = join(tempHome(), 'bundle');
	cpSync(bundle, dir, {recursive: true});
	const script = join(dir, 'curve-script.cjs');
	if (cache === 'no script') rmSync(script);
	if (typeof cache === 'string') rmSync(codeCachePath(script));
	else writeFileSync(codeCachePath(script), cache);
	return join(dir, 'evenecho.cjs');
}

const commandLines: {args: string[]; input?: string}[] = [
	{args: ['curve', preset('upper-abdomen')]},
	{args: ['curve', preset('kidney'), '--format', 'json', '--step', '0.05']},
	{args: ['curve', preset('breast'), '--format', 'csv']},
	{args: ['curve', preset('kidney'), '--against', preset('upper-abdomen')]},
	{args: ['curve', '-'], input: readFileSync(preset('neck-superficial'), 'utf8')},
	{args: ['curve', preset('kidney'), '--format', 'xml']},
	{args: ['curve', join(repoRoot, 'no-such-plan.json')]},
	{args: ['help', 'curve']},
];

describe('the precompiled curve script', () => {
	it('is built with a code cache that this Node accepts', () => {
		const compiled = compileScript(
			scriptPath,
			readFileSync(scriptPath, 'utf8'),
			readFileSync(codeCachePath(scriptPath)),
		);
		expect(compiled.script.cachedDataRejected).toBe(false);
	});

	it('prints what the modules print, byte for byte, with the same exit codes', () => {
		const modules = bundleCopy('no script');
		for (const {args, input} of commandLines) {
			expect(run(cliPath, args, input), args.join(' ')).toEqual(run(modules, args, input));
		}
	});

	it('only reads the bundle folder', () => {
		const state = () => readdirSync(bundle).map((name) => `${name} ${statSync(join(bundle, name)).mtimeMs}`);
		const before = state();
		expect(run(cliPath, ['curve', preset('upper-abdomen')]).status).toBe(0);
		expect(state()).toEqual(before);
	});

	it('runs the same from a cache V8 refuses, an empty one or none', () => {
		const expected = run(cliPath, ['curve', preset('upper-abdomen'), '--format', 'json']);
		expect(expected.status).toBe(0);
		for (const cache of [
			Buffer.from('not a code cache'),
			Buffer.alloc(0),
			Buffer.alloc(4096, 7),
			'no cache' as const,
		]) {
			expect(run(bundleCopy(cache), ['curve', preset('upper-abdomen'), '--format', 'json'])).toEqual(expected);
		}
	});
});
