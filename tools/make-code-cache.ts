/**
 * Stores V8's code cache beside the precompiled curve script (see src/runtime/precompiled-script.ts),
 * at build time. A child Node, started without NODE_OPTIONS so its V8 flags are those of a plain
 * `node` start, runs the script's `curve` on every shipped preset (receive modes, barriers and
 * depths differ between them) and in each output format (output thrown away), then saves what V8
 * compiled: the script and every function those runs compiled.
 */
import {spawnSync} from 'node:child_process';
import {readdirSync, readFileSync, writeFileSync} from 'node:fs';
import {dirname, join} from 'node:path';
import {fileURLToPath} from 'node:url';
import {codeCachePath, compileScript} from '../src/runtime/precompiled-script.js';

const here = fileURLToPath(import.meta.url);
const root = join(dirname(here), '..', '..');
const scriptPath = join(root, 'dist', 'bundle', 'curve-script.cjs');
const presets = join(root, 'presets');

async function train(): Promise<void> {
	const compiled = compileScript(scriptPath, readFileSync(scriptPath, 'utf8'));
	// Each run adds its own error listener to stdout, as a command does once per process.
	process.stdout.setMaxListeners(64);
	const run = compiled.run()['runCommandLine'] as (argv: readonly string[]) => Promise<void>;
	for (const name of readdirSync(presets)
		.filter((f) => f.endsWith('.json'))
		.sort())
		for (const format of ['text', 'json', 'csv'])
			await run([process.execPath, 'evenecho', 'curve', join(presets, name), '--format', format]);
	writeFileSync(codeCachePath(scriptPath), compiled.script.createCachedData());
}

if (process.argv[2] === '--train') await train();
else {
	const {NODE_OPTIONS: _ignored, ...env} = process.env;
	const r = spawnSync(process.execPath, [here, '--train'], {env, stdio: ['ignore', 'ignore', 'inherit']});
	if (r.status !== 0) throw new Error(`the code cache of ${scriptPath} was not made (exit ${r.status})`);
}
