/**
 * Standard output that is known to be written: resolves once the text has gone out, rejects if it
 * could not (a full device), so a command never says "exported" before the export has happened.
 */
import {UsageError} from '../errors/usage-error.js';

export class OutputError extends UsageError {}

export function writeOutput(text: string): Promise<void> {
	return new Promise((resolve, reject) => {
		process.stdout.write(text, (error) => {
			if (!error) return resolve();
			const code = (error as NodeJS.ErrnoException).code;
			reject(
				new OutputError(
					`cannot write the output${code === 'ENOSPC' ? ' (the device is full)' : code ? ` (${code})` : ''}; nothing was exported`,
				),
			);
		});
	});
}
