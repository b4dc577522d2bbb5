/**
 * What a crash leaves behind: a multi-file write killed half way is rolled back on the next start
 * (new files gone, replaced ones back, temporary files removed) and can simply be run again; stray
 * temporary files are swept, also when their time lies in the future; held files are put back.
 */
import {spawn} from 'node:child_process';
import {readdirSync, readFileSync, utimesSync, writeFileSync} from 'node:fs';
import {hostname} from 'node:os';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {commitBatch, recoverBatches} from '../../src/files/file-batch.js';
import {tempPathFor} from '../../src/files/atomic-write.js';
import {heldTag} from '../../src/files/guarded-change.js';
import {staleAfterMs, sweepTemps} from '../../src/files/temp-sweep.js';
import {cleanTempHomes, repoRoot, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

/** Runs the crash fixture and resolves with how it ended (a timeout fails the test, never hangs it). */
function crashAfter(dir: string, index: number): Promise<NodeJS.Signals | null> {
	return new Promise((resolve, reject) => {
		const child = spawn(
			process.execPath,
			[join(repoRoot, 'test', 'fixtures', 'files', 'crash-batch.mjs'), dir, String(index)],
			{stdio: 'ignore', timeout: 15_000},
		);
		child.on('error', reject);
		child.on('exit', (_code, signal) => resolve(signal));
	});
}

describe('a batch write killed half way', () => {
	it('is rolled back on the next start, old files back, no temporary files; a retry then succeeds', async () => {
		const dir = tempHome();
		writeFileSync(join(dir, 'a.json'), 'old a\n');
		expect(await crashAfter(dir, 1)).toBe('SIGKILL');
		// The crash left a half-done state: a and b replaced, c not, a journal and temporary files.
		expect(readFileSync(join(dir, 'a.json'), 'utf8')).toBe('new a.json\n');
		expect(readdirSync(dir).some((n) => n.endsWith('.journal'))).toBe(true);

		const notices = recoverBatches(dir);
		expect(notices).toHaveLength(1);
		expect(notices[0]).toContain('rolled back');
		expect(readdirSync(dir)).toEqual(['a.json']);
		expect(readFileSync(join(dir, 'a.json'), 'utf8')).toBe('old a\n');

		commitBatch(
			dir,
			['a.json', 'b.json', 'c.json'].map((name) => ({name, data: `retry ${name}`})),
			{replace: true},
		);
		expect(readdirSync(dir).sort()).toEqual(['a.json', 'b.json', 'c.json']);
		expect(readFileSync(join(dir, 'a.json'), 'utf8')).toBe('retry a.json');
	});

	it('a failure inside the process rolls back at once', () => {
		const dir = tempHome();
		writeFileSync(join(dir, 'a.json'), 'old a\n');
		expect(() =>
			commitBatch(
				dir,
				[
					{name: 'a.json', data: 'x'},
					{name: 'b.json', data: 'y'},
				],
				{
					replace: true,
					pause: (_point, index) => {
						if (index === 1) throw new Error('simulated failure');
					},
				},
			),
		).toThrow();
		expect(readdirSync(dir)).toEqual(['a.json']);
		expect(readFileSync(join(dir, 'a.json'), 'utf8')).toBe('old a\n');
	});

	it('without leave to replace, a taken name refuses the whole batch and touches nothing', () => {
		const dir = tempHome();
		writeFileSync(join(dir, 'b.json'), 'mine\n');
		expect(() =>
			commitBatch(
				dir,
				[
					{name: 'a.json', data: 'x'},
					{name: 'b.json', data: 'y'},
				],
				{replace: false},
			),
		).toThrow(/already exists/);
		expect(readdirSync(dir)).toEqual(['b.json']);
		expect(readFileSync(join(dir, 'b.json'), 'utf8')).toBe('mine\n');
	});

	it('the journal of a live process is left alone', () => {
		const dir = tempHome();
		writeFileSync(
			join(dir, '.batch.000000000000000000000000.journal'),
			JSON.stringify({pid: process.pid, host: hostname(), state: 'placing', items: []}),
		);
		expect(recoverBatches(dir)).toEqual([]);
		expect(readdirSync(dir)).toHaveLength(1);
	});
});

describe('sweepTemps', () => {
	it('removes stale temporary files, including ones dated in the future; keeps fresh ones', () => {
		const dir = tempHome();
		const now = Date.now();
		const old = tempPathFor(join(dir, 'a.json'));
		const future = tempPathFor(join(dir, 'b.json'));
		const fresh = tempPathFor(join(dir, 'c.json'));
		for (const f of [old, future, fresh]) writeFileSync(f, 'x');
		utimesSync(old, new Date(now - 2 * staleAfterMs), new Date(now - 2 * staleAfterMs));
		utimesSync(future, new Date(now + 2 * staleAfterMs), new Date(now + 2 * staleAfterMs));
		sweepTemps(dir, now);
		expect(readdirSync(dir).map((n) => join(dir, n))).toEqual([fresh]);
	});

	it('puts a held file back under its name when a crash left it aside', () => {
		const dir = tempHome();
		const held = tempPathFor(join(dir, 'liver.json'), heldTag);
		writeFileSync(held, 'the preset\n');
		const past = new Date(Date.now() - 2 * staleAfterMs);
		utimesSync(held, past, past);
		expect(sweepTemps(dir)).toEqual(['liver.json']);
		expect(readdirSync(dir)).toEqual(['liver.json']);
		expect(readFileSync(join(dir, 'liver.json'), 'utf8')).toBe('the preset\n');
	});
});
