/**
 * Test helpers for the preset store: a fresh temporary store folder per test (removed afterwards),
 * a snapshot of a folder's files for "nothing changed" checks, and running the built CLI.
 */
import {spawnSync} from 'node:child_process';
import {mkdtempSync, readdirSync, readFileSync, rmSync, statSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {dirname, join, relative} from 'node:path';
import {fileURLToPath} from 'node:url';
import {afterEach} from 'vitest';

export const repoRoot = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
import {cliPath as distCli} from './run-cli.js';

export {distCli};
export const distStore = join(repoRoot, 'dist', 'src', 'store', 'preset-store.js');

const made: string[] = [];

/** Registers clean-up for every folder `tempHome()` makes in this file. Call once at top level. */
export function cleanTempHomes(): void {
	afterEach(() => {
		for (const dir of made.splice(0)) rmSync(dir, {recursive: true, force: true});
	});
}

/** A new, empty temporary folder, removed after the test. */
export function tempHome(): string {
	const dir = mkdtempSync(join(tmpdir(), 'evenecho-test-'));
	made.push(dir);
	return dir;
}

/** Every file under `dir` (relative path → content), for before/after comparisons. */
export function snapshotDir(dir: string): Record<string, string> {
	const out: Record<string, string> = {};
	const walk = (d: string) => {
		let names: string[];
		try {
			names = readdirSync(d);
		} catch {
			return;
		}
		for (const name of names.sort()) {
			const full = join(d, name);
			if (statSync(full).isDirectory()) walk(full);
			else out[relative(dir, full)] = readFileSync(full, 'utf8');
		}
	};
	walk(dir);
	return out;
}

/** Fails early, with a clear message, when the built files are missing or older than the sources. */
export function assertBuilt(): void {
	const pairs = [
		'store/preset-store',
		'store/templates',
		'store/preset-record',
		'store/preset-bundle',
		'store/safe-name',
		'store/settings-file',
		'store/record-folder',
		'store/scanner-profile-store',
		'files/atomic-write',
		'files/bounded-read',
		'cli/presets-command',
	];
	for (const p of pairs) {
		const src = join(repoRoot, 'src', `${p}.ts`);
		const out = join(repoRoot, 'dist', 'src', `${p}.js`);
		let built: number;
		try {
			built = statSync(out).mtimeMs;
		} catch {
			throw new Error(`${out} is missing: run "npm run build" first (npm test does)`);
		}
		// An incremental build leaves a file alone when its output would not change, so a source newer than
		// its output is stale only if no build has run since (the build info is rewritten on every build).
		const lastBuild = Math.max(
			built,
			statSync(join(repoRoot, 'dist', '.tsbuildinfo'), {throwIfNoEntry: false})?.mtimeMs ?? 0,
		);
		if (statSync(src).mtimeMs > lastBuild + 1) {
			throw new Error(`${out} is older than ${src}: run "npm run build" first (npm test does)`);
		}
	}
}

export interface CliRun {
	readonly status: number | null;
	readonly stdout: string;
	readonly stderr: string;
}

/** Runs the shipped CLI (dist/bundle/evenecho.cjs) with …args with EVENECHO_HOME set to `home`. */
export function runCli(args: readonly string[], home: string, input?: string): CliRun {
	const env: NodeJS.ProcessEnv = {...process.env, EVENECHO_HOME: home};
	delete env['EVENECHO_DEBUG'];
	const r = spawnSync(process.execPath, [distCli, ...args], {
		env,
		encoding: 'utf8',
		...(input !== undefined ? {input} : {}),
		timeout: 20_000,
	});
	return {status: r.status, stdout: r.stdout, stderr: r.stderr};
}
