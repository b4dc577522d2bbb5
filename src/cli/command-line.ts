/**
 * One run of the `evenecho` command line: the program parsed and run, and every error reported the
 * one way. Bad input: one message on stderr, exit code 2, nothing on stdout. Shared by the module
 * entry (main.ts) and the precompiled curve script (curve-script.ts).
 */
import {CommanderError} from 'commander';
import {FileRefusedError} from '../files/file-errors.js';
import {printable} from '../files/printable.js';
import {buildProgram} from './program.js';
import {badInputExit, UsageError} from '../errors/usage-error.js';

function reportAndExit(error: unknown): never {
	// Messages quote file names, keys and values: made printable once more here, the last door.
	if (error instanceof UsageError) {
		process.stderr.write(`evenecho: ${printable(error.message, 2000)}\n`);
		for (const d of error.details) process.stderr.write(`  ${printable(d, 2000)}\n`);
		process.exit(badInputExit);
	}
	if (error instanceof FileRefusedError) {
		process.stderr.write(`evenecho: ${printable(error.message, 2000)}\n`);
		process.exit(badInputExit);
	}
	if (error instanceof CommanderError) {
		process.exit(error.exitCode === 0 ? 0 : badInputExit);
	}
	// Not the user's fault: still no stack trace unless asked for.
	process.stderr.write(`evenecho: internal error: ${printable((error as Error)?.message ?? String(error), 400)}\n`);
	if (process.env['EVENECHO_DEBUG']) process.stderr.write(`${(error as Error)?.stack ?? ''}\n`);
	process.exit(1);
}

/** Runs a command line (`argv` as process.argv has it: node, script, then the arguments). */
export async function runCommandLine(argv: readonly string[] = process.argv): Promise<void> {
	// A reader that stops early (`evenecho … | head`) is not an error: end quietly, no stack trace.
	// Any other failure to write the output (a full disk) is said plainly; commands that report
	// success on standard error wait for their output to be written first (see write-output.ts).
	process.stdout.on('error', (error: NodeJS.ErrnoException) => {
		if (error.code === 'EPIPE') process.exit(0);
		const why = error.code === 'ENOSPC' ? ' (the device is full)' : error.code ? ` (${error.code})` : '';
		process.stderr.write(`evenecho: cannot write the output${why}; it is incomplete\n`);
		process.exit(1);
	});
	try {
		await (await buildProgram(argv.slice(2))).parseAsync([...argv]);
	} catch (error) {
		reportAndExit(error);
	}
}
