/** A problem with what the user gave us: printed as one clear message, exit code 2, no stack trace. */
export class UsageError extends Error {
	constructor(
		message: string,
		readonly details: readonly string[] = [],
	) {
		super(message);
		this.name = 'UsageError';
	}
}

/** Exit code for bad input (plan, options, files). */
export const badInputExit = 2;
