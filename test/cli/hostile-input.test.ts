/**
 * The CLI's doors against hostile input: special files and endless inputs (refused or capped, and
 * signals still work while waiting), control characters (never printed raw), encodings and
 * duplicate keys (one rule everywhere), and the smaller rules (one target-depth rule, unknown
 * commands named, repeated options refused, no success printed before a failed write).
 */
import {execFileSync, spawnSync} from 'node:child_process';
import {closeSync, openSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {cliPath, runCli} from '../helpers/run-cli.js';
import {spawnCli} from '../helpers/spawn-cli.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

/** Raw terminal control: C0 but tab and line feed, DEL, C1, and the bidi overrides. */
const rawControl = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/u;

function planText(overrides: Record<string, unknown> = {}): string {
	return JSON.stringify({...demoPlan(), ...overrides}, null, 2);
}

function fifoIn(dir: string, name = 'plan.json'): string {
	const path = join(dir, name);
	execFileSync('mkfifo', [path]);
	return path;
}

describe('special files and endless input', () => {
	it('a FIFO given as the plan (or --against, --from, import) is refused at once; nothing waits for a writer', async () => {
		const home = tempHome();
		const fifo = fifoIn(home);
		const good = join(home, 'good.json');
		writeFileSync(good, planText());
		const doors = [
			['curve', fifo],
			['curve', good, '--against', fifo],
			['ladder', fifo],
			['table', fifo, '--fat', '1,2'],
			['presets', 'save', 'Piped', '--from', fifo],
			['presets', 'import', fifo],
		];
		const runs = await Promise.all(
			doors.map((args) => spawnCli(args, {env: {EVENECHO_HOME: home}, timeoutMs: 15_000}).ended),
		);
		runs.forEach((r, i) => {
			expect(r.timedOut, `${doors[i]!.join(' ')} hung`).toBe(false);
			expect(r.code, doors[i]!.join(' ')).toBe(2);
			expect(r.stderr).toContain('is a named pipe (FIFO), not a regular file');
			expect(r.stdout).toBe('');
		});
	});

	it('/dev/zero as a file is refused as a device; as standard input it is capped at 1 MB', async () => {
		const byName = runCli(['curve', '/dev/zero']);
		expect(byName.status).toBe(2);
		expect(byName.stderr).toContain('/dev/zero: is a character device, not a regular file');
		const zero = openSync('/dev/zero', 'r');
		try {
			const r = await spawnCli(['curve', '-'], {stdin: zero, timeoutMs: 15_000}).ended;
			expect(r.timedOut).toBe(false);
			expect(r.code).toBe(2);
			expect(r.stderr).toContain('standard input: the plan is larger than the limit of 1,000,000 bytes');
		} finally {
			closeSync(zero);
		}
	});

	it('an endless standard input is read only to the cap: the writer is cut off after a few MB at most', async () => {
		const run = spawnCli(['presets', 'import', '-'], {env: {EVENECHO_HOME: tempHome()}, timeoutMs: 20_000});
		const chunk = Buffer.alloc(1 << 16, 0x20);
		let accepted = 0;
		let open = true;
		run.child.stdin!.on('error', () => (open = false));
		run.child.on('close', () => (open = false));
		// Write as fast as the child reads, until it stops reading (closes the pipe) or exits.
		while (open && accepted < 64 << 20) {
			const flushed = run.child.stdin!.write(chunk);
			accepted += chunk.length;
			if (!flushed)
				await new Promise((resolve) => {
					run.child.stdin!.once('drain', resolve);
					run.child.once('close', resolve);
				});
		}
		const r = await run.ended;
		expect(r.timedOut).toBe(false);
		expect(r.code).toBe(2);
		expect(r.stderr).toContain('larger than the limit of 1,000,000 bytes');
		// The cap plus what the pipe and the stream buffers held: far below an unbounded read.
		expect(accepted).toBeLessThan(8 << 20);
	});

	it('SIGINT and SIGTERM end a command that waits on standard input', async () => {
		for (const signal of ['SIGINT', 'SIGTERM'] as const) {
			const run = spawnCli(['presets', 'import', '-'], {env: {EVENECHO_HOME: tempHome()}, timeoutMs: 15_000});
			// 256 KB of blanks (valid JSON so far), more than a pipe holds: when the write completes,
			// the child is in its read loop. The pipe then stays open, as from a stalled writer.
			await new Promise<void>((resolve) => run.child.stdin!.write(Buffer.alloc(256 << 10, 0x20), () => resolve()));
			run.child.kill(signal);
			const r = await run.ended;
			expect(r.timedOut, `${signal} was ignored`).toBe(false);
			run.child.stdin!.destroy();
		}
	});
});

describe('control characters never reach the terminal raw', () => {
	const hostile = '\u001b]0;owned\u0007\u001b[2J\u009b31m\u202e';

	const cases: Array<[string, Record<string, unknown>, string]> = [
		[
			'name',
			{name: `Liver${hostile}`},
			'name: contains a control or invisible formatting character (U+001B at character 6)',
		],
		[
			'name on two lines',
			{name: 'Liver\nthick fat'},
			'name: must be one line without control or invisible formatting characters (found U+000A',
		],
		['region', {region: `abdomen${hostile}`}, 'region: contains a control'],
		['note', {note: `see${hostile}`}, 'note: contains a control'],
		['unknown key', {[`x${hostile}`]: 1}, '(top): a key contains a control or invisible formatting character'],
		['tissue id', {layers: [{tissue: `fat${hostile}`, thicknessCm: 1}]}, 'layers.0.tissue: contains a control'],
		[
			'custom label',
			{
				layers: [
					{
						tissue: {label: `mine${hostile}`, speedMps: 1540, densityKgM3: 1000, alphaDbPerCmMhz: 0.5, exponent: 1},
						thicknessCm: 1,
					},
				],
			},
			'layers.0.tissue.label: contains a control',
		],
		[
			'custom label on two lines',
			{
				layers: [
					{
						tissue: {label: 'mine\ntoo', speedMps: 1540, densityKgM3: 1000, alphaDbPerCmMhz: 0.5, exponent: 1},
						thicknessCm: 1,
					},
				],
			},
			'layers.0.tissue',
		],
	];

	it.each(cases)(
		'%s: refused at every door by the one text rule; the message shows escapes only',
		(what, overrides, expected) => {
			const home = tempHome();
			const file = join(home, 'plan.json');
			writeFileSync(file, planText(overrides));
			for (const args of [
				['curve', file],
				['ladder', file],
				['table', file, '--fat', '1'],
				['presets', 'save', 'X', '--from', file],
				['presets', 'import', file],
			]) {
				const r = runCli(args, {env: {EVENECHO_HOME: home}});
				expect(r.status, `${what}: ${args[0]}`).toBe(2);
				expect(r.stderr, `${what}: ${args.join(' ')}`).toContain(expected);
				expect(rawControl.test(r.stderr + r.stdout), `${what}: ${args.join(' ')} printed raw control characters`).toBe(
					false,
				);
			}
		},
	);

	it('a file name and a syntax error quoting hostile bytes are shown escaped', () => {
		const home = tempHome();
		const named = join(home, `plan${hostile}.json`);
		const missing = runCli(['curve', named]);
		expect(missing.status).toBe(2);
		expect(rawControl.test(missing.stderr)).toBe(false);
		expect(missing.stderr).toContain('\\u001b');
		writeFileSync(join(home, 'broken.json'), `{"name": ${hostile}}`);
		const broken = runCli(['curve', join(home, 'broken.json')]);
		expect(broken.status).toBe(2);
		expect(broken.stderr).toContain('not valid JSON');
		expect(rawControl.test(broken.stderr)).toBe(false);
	});

	it('an unknown command quoting escapes is shown escaped', () => {
		const r = runCli([`cur${hostile}`]);
		expect(r.status).toBe(2);
		expect(rawControl.test(r.stderr)).toBe(false);
	});
});

describe('one rule for encodings and duplicate keys, at every door', () => {
	it('a plan with a byte-order mark is accepted by the commands and by import alike', () => {
		const home = tempHome();
		const file = join(home, 'bom.json');
		writeFileSync(file, `\ufeff${planText({name: 'Marked plan'})}`);
		expect(runCli(['curve', file]).status).toBe(0);
		expect(runCli(['ladder', file]).status).toBe(0);
		expect(runCli(['presets', 'save', 'Marked', '--from', file], {env: {EVENECHO_HOME: home}}).status).toBe(0);
		expect(runCli(['presets', 'import', file], {env: {EVENECHO_HOME: home}}).status).toBe(0);
	});

	it('a UTF-16 plan is refused everywhere with the encoding named and what to do', () => {
		const home = tempHome();
		const file = join(home, 'wide.json');
		writeFileSync(file, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(planText(), 'utf16le')]));
		for (const args of [
			['curve', file],
			['presets', 'import', file],
			['presets', 'save', 'Wide', '--from', file],
		]) {
			const r = runCli(args, {env: {EVENECHO_HOME: home}});
			expect(r.status).toBe(2);
			expect(r.stderr).toContain('is UTF-16 (little-endian) text; evenecho reads UTF-8 only: save it as UTF-8');
			expect(rawControl.test(r.stderr)).toBe(false);
		}
	});

	it('a key given twice is refused with the key named, by the commands and by import', () => {
		const home = tempHome();
		const file = join(home, 'twice.json');
		writeFileSync(file, planText().replace('"probe": {', '"probe": {"centerMhz": 9, '));
		for (const args of [
			['curve', file],
			['presets', 'import', file],
		]) {
			const r = runCli(args, {env: {EVENECHO_HOME: home}});
			expect(r.status).toBe(2);
			expect(r.stderr).toContain('probe: the key "centerMhz" appears more than once');
		}
	});
});

describe('smaller rules', () => {
	it("ladder --target deeper than the display is refused, like a plan's own target", () => {
		const home = tempHome();
		const file = join(home, 'plan.json');
		writeFileSync(file, planText({display: {depthCm: 12}}));
		const r = runCli(['ladder', file, '--target', '14']);
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('--target: must be a number above 0 and up to 12 cm');
		writeFileSync(file, planText({display: {depthCm: 12}, targetDepthCm: 14}));
		expect(runCli(['ladder', file]).stderr).toContain('targetDepthCm: must not be deeper than display.depthCm');
	});

	it('an unknown command is called that, with the list of commands', () => {
		const top = runCli(['frobnicate']);
		expect(top.status).toBe(2);
		expect(top.stderr).toContain(
			'unknown command "frobnicate"; the commands are: curve, ladder, presets, refine, table, preview, simulate, scanner',
		);
		const sub = runCli(['presets', 'frobnicate']);
		expect(sub.status).toBe(2);
		expect(sub.stderr).toContain('unknown command "presets frobnicate"; the commands are: presets list, presets show');
	});

	it('an option given twice is refused, naming it; --swap may repeat', () => {
		const home = tempHome();
		const file = join(home, 'plan.json');
		writeFileSync(file, planText());
		const r = runCli(['curve', file, '--format', 'json', '--format', 'csv']);
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('--format: given more than once');
		expect(r.stdout).toBe('');
		expect(runCli(['table', file, '--swap', '1=fat', '--swap', '2=liver']).status).toBe(0);
	});

	it('exporting to a full device prints no success, only the error', () => {
		const full = openSync('/dev/full', 'w');
		try {
			const env: NodeJS.ProcessEnv = {...process.env, EVENECHO_HOME: tempHome()};
			const r = spawnSync(process.execPath, [cliPath, 'presets', 'export', '-', 'breast'], {
				env,
				stdio: ['ignore', full, 'pipe'],
				encoding: 'utf8',
				timeout: 20_000,
			});
			expect(r.status).not.toBe(0);
			expect(r.stderr).toContain('cannot write the output (the device is full)');
			expect(r.stderr).not.toContain('exported 1 preset');
		} finally {
			closeSync(full);
		}
	});
});
