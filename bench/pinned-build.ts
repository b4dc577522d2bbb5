/**
 * The yardstick: an earlier commit of this repository compiled with tsc into a temporary folder, so
 * every "× faster than before" is measured against it in the same run. Nothing of it is committed;
 * the compiled copy is kept in the temp folder per commit and reused by later runs.
 */
import {execFileSync} from 'node:child_process';
import {existsSync, mkdirSync, rmSync, symlinkSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';

/** The commit the speed issue measured ("today's code" when it was filed). Override with EVENECHO_BENCH_PINNED. */
export const pinnedCommit = process.env['EVENECHO_BENCH_PINNED'] ?? '4b71f78';

/**
 * The second yardstick: the model as it stood when the engine's speed work began (the band's model
 * and the fit's split rule changed on purpose after {@link pinnedCommit}). Every output of this tree
 * is compared with it, so a speed-up that moved an output shows. Override with EVENECHO_BENCH_MODEL_PINNED.
 */
export const modelPinnedCommit = process.env['EVENECHO_BENCH_MODEL_PINNED'] ?? '4640513';

export interface PinnedBuild {
	readonly commit: string;
	/** The compiled tree: `<dir>/src/engine/…`, `<dir>/src/table/…`. */
	readonly distDir: string;
}

/** The repository this bench runs in (git's own answer, from the working directory). */
function repoRoot(): string {
	return execFileSync('git', ['rev-parse', '--show-toplevel'], {encoding: 'utf8'}).trim();
}

/** Extracts and compiles a commit (by default the pinned one) once (≈ 15 s), then reuses it. */
export function pinnedBuild(ref: string = pinnedCommit): PinnedBuild {
	const root = repoRoot();
	const commit = execFileSync('git', ['-C', root, 'rev-parse', '--short=12', ref], {encoding: 'utf8'}).trim();
	const dir = join(tmpdir(), `evenecho-pinned-${commit}`);
	const distDir = join(dir, 'dist');
	const done = join(dir, '.built');
	if (existsSync(done)) return {commit, distDir};
	rmSync(dir, {recursive: true, force: true});
	mkdirSync(dir, {recursive: true});
	const archive = execFileSync(
		'git',
		['-C', root, 'archive', '--format=tar', commit, 'src', 'package.json', 'tsconfig.json'],
		{
			maxBuffer: 1 << 28,
		},
	);
	execFileSync('tar', ['-x', '-C', dir], {input: archive});
	symlinkSync(join(root, 'node_modules'), join(dir, 'node_modules'), 'dir');
	writeFileSync(
		join(dir, 'tsconfig.pinned.json'),
		JSON.stringify({
			extends: './tsconfig.json',
			compilerOptions: {noEmit: false, outDir: 'dist', rootDir: '.', sourceMap: false, noUnusedLocals: false},
			include: ['src'],
		}),
	);
	process.stdout.write(`  (compiling the pinned build ${commit} into ${dir} …)\n`);
	execFileSync(join(root, 'node_modules', '.bin', 'tsc'), ['-p', join(dir, 'tsconfig.pinned.json')], {
		cwd: dir,
		stdio: 'inherit',
	});
	writeFileSync(done, `${commit}\n`);
	return {commit, distDir};
}

/** Imports one module of the pinned build, e.g. `src/engine/compensation-curve.js`. */
export async function importPinned<T>(build: PinnedBuild, path: string): Promise<T> {
	return (await import(join(build.distDir, path))) as T;
}
