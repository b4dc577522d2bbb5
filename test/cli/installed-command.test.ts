/**
 * The `evenecho` command as `npm link` installs it: package.json "bin" points at the bundle, and the
 * link runs that file itself (through its `#!/usr/bin/env node` line), so it must stay executable
 * after every build. The bundler writes a fresh file without the executable bit, and `npm test`
 * rebuilds: before the build script set the bit, the README's second quick-start command left the
 * first one's `evenecho` answering "Permission denied".
 */
import {spawnSync} from 'node:child_process';
import {readFileSync, statSync} from 'node:fs';
import {describe, expect, it} from 'vitest';
import {cliPath} from '../helpers/run-cli.js';

const manifest = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as {
	version: string;
	bin: Record<string, string>;
};

describe('the installed command', () => {
	it('is the built bundle, a script that starts node itself', () => {
		expect(new URL(`../../${manifest.bin['evenecho']}`, import.meta.url).pathname).toBe(cliPath);
		expect(readFileSync(cliPath, 'utf8').split('\n', 1)[0]).toBe('#!/usr/bin/env node');
	});

	it('stays executable after a build, and runs as a program', () => {
		expect(statSync(cliPath).mode & 0o111).toBe(0o111);
		const r = spawnSync(cliPath, ['--version'], {encoding: 'utf8'});
		expect(r.status).toBe(0);
		expect(r.stdout.trim()).toBe(manifest.version);
	});
});
