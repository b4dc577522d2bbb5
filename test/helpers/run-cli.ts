/** Runs the built CLI (npm test builds first) as a user would, capturing everything. */
import {spawnSync} from 'node:child_process';
import {fileURLToPath} from 'node:url';

/** The shipped entry (the bundle `npm run build` makes; package.json "bin" points at it). */
export const cliPath = fileURLToPath(new URL('../../dist/bundle/evenecho.cjs', import.meta.url));

export interface CliRun {
	readonly status: number | null;
	readonly stdout: string;
	readonly stderr: string;
}

export function runCli(
	args: readonly string[],
	options: {input?: string; env?: Record<string, string>; cwd?: string} = {},
): CliRun {
	const r = spawnSync(process.execPath, [cliPath, ...args], {
		input: options.input ?? '',
		encoding: 'utf8',
		env: {...process.env, ...options.env},
		cwd: options.cwd,
		timeout: 60_000,
	});
	return {status: r.status, stdout: r.stdout, stderr: r.stderr};
}
