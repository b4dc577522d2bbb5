/**
 * Runs the built CLI as a child process without blocking the test: the caller can feed standard
 * input, send signals and wait for the exit, always with a timeout that kills the child, so a hang
 * fails the test instead of stalling the run. No fixed sleeps: callers wait for conditions.
 */
import {spawn, type ChildProcess} from 'node:child_process';
import {cliPath} from './run-cli.js';

export interface Ended {
	readonly code: number | null;
	readonly signal: NodeJS.Signals | null;
	readonly stdout: string;
	readonly stderr: string;
	/** True when the timeout had to kill it. */
	readonly timedOut: boolean;
}

export interface Running {
	readonly child: ChildProcess;
	readonly ended: Promise<Ended>;
}

export function spawnCli(
	args: readonly string[],
	options: {env?: Record<string, string>; stdin?: 'pipe' | 'ignore' | number; timeoutMs?: number; cwd?: string} = {},
): Running {
	const env: NodeJS.ProcessEnv = {...process.env, ...options.env};
	delete env['EVENECHO_DEBUG'];
	const child = spawn(process.execPath, [cliPath, ...args], {
		env,
		cwd: options.cwd,
		stdio: [options.stdin ?? 'pipe', 'pipe', 'pipe'],
	});
	let stdout = '';
	let stderr = '';
	child.stdout!.setEncoding('utf8').on('data', (d: string) => (stdout += d));
	child.stderr!.setEncoding('utf8').on('data', (d: string) => (stderr += d));
	const ended = new Promise<Ended>((resolve) => {
		let timedOut = false;
		const timer = setTimeout(() => {
			timedOut = true;
			child.kill('SIGKILL');
		}, options.timeoutMs ?? 15_000);
		child.on('close', (code, signal) => {
			clearTimeout(timer);
			resolve({code, signal, stdout, stderr, timedOut});
		});
	});
	// A child that stops reading makes our writes fail with EPIPE: expected, not a test error.
	child.stdin?.on('error', () => {});
	return {child, ended};
}
