/**
 * Stores V8's code cache beside the precompiled curve script (see src/runtime/precompiled-script.ts),
 * at build time. A child Node, started without NODE_OPTIONS so its V8 flags are those of a plain
 * `node` start, runs the script's `curve` on a built-in preset in each output format (output thrown
 * away) and then saves what V8 compiled: the script and every function those runs compiled.
 */
import {spawnSync} from 'node:child_process';
import {readFileSync, writeFileSync} from 'node:fs';
import {dirname, join} from 'node:path';
import {fileURLToPath} from 'node:url';
import {codeCachePath, compileScript} from '../src/runtime/precompiled-script.js';

const here = fileURLToPath(import.meta.url);
const root = join(dirname(here), '..', '..');
const scriptPath = join(root, 'dist', 'bundle', 'curve-script.cjs');
const preset = join(root, 'presets', 'upper-abdomen.json');

async function train(): Promise<void> {
	const compiled = compileScript(scriptPath, readFileSync(scriptPath, 'utf8'));
	const run = compiled.run()['runCommandLine'] as (argv: readonly string[]) => Promise<void>;
	for (const format of ['text', 'json', 'csv'])
		await run([process.execPath, 'evenecho', 'curve', preset, '--format', format]);
	writeFileSync(codeCachePath(scriptPath), compiled.script.createCachedData());
}

if (process.argv[2] === '--train') await train();
else {
	const {NODE_OPTIONS: _ignored, ...env} = process.env;
	const r = spawnSync(process.execPath, [here, '--train'], {env, stdio: ['ignore', 'ignore', 'inherit']});
	if (r.status !== 0) throw new Error(`the code cache of ${scriptPath} was not made (exit ${r.status})`);
}
