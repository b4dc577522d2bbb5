/**
 * Both bundles give commander a stand-in for child_process (tools/commander-without-child-process.ts):
 * commander loads it at its top only to start sub-commands that are programs of their own, and
 * loading it pulls in net, dgram and the streams at every start. The stand-in offers `spawn` alone,
 * so commander must use nothing else of it; and the built command must start without it.
 */
import {spawnSync} from 'node:child_process';
import {mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {createRequire} from 'node:module';
import {tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {cliPath} from '../helpers/run-cli.js';

describe('commander without child_process', () => {
	it('commander uses child_process for spawn only', () => {
		// The package exports only its entry; its lib folder sits beside it.
		const entry = createRequire(import.meta.url).resolve('commander');
		const lib = join(dirname(entry), 'lib');
		const requiring = readdirSync(lib).filter((f) => readFileSync(join(lib, f), 'utf8').includes('child_process'));
		expect(requiring).toEqual(['command.js']);
		const source = readFileSync(join(lib, 'command.js'), 'utf8');
		const uses = [...source.matchAll(/childProcess\.(\w+)/g)].map((m) => m[1]);
		expect(uses.length).toBeGreaterThan(0);
		expect(new Set(uses)).toEqual(new Set(['spawn']));
	});

	it('the built command answers --help and curve without loading child_process', () => {
		const dir = mkdtempSync(join(tmpdir(), 'evenecho-modules-'));
		try {
			// Preloaded: on exit, the Node built-ins the process loaded.
			const probe = join(dir, 'loaded.cjs');
			writeFileSync(
				probe,
				'process.on("exit", () => require("fs").writeSync(2, "\\nLOADED " + process.moduleLoadList.join(",")));',
			);
			const plan = new URL('../../presets/kidney.json', import.meta.url).pathname;
			for (const args of [['--help'], ['curve', plan]]) {
				const r = spawnSync(process.execPath, ['-r', probe, cliPath, ...args], {encoding: 'utf8'});
				expect(r.status).toBe(0);
				const loaded = r.stderr.slice(r.stderr.lastIndexOf('LOADED ') + 7).split(',');
				expect(loaded).toContain('NativeModule fs');
				expect(loaded).not.toContain('NativeModule child_process');
			}
		} finally {
			rmSync(dir, {recursive: true, force: true});
		}
	});
});
