/**
 * Refusals from the file layer: the named path exists but is the wrong kind of thing, is too big,
 * is taken, or changed under us. The message names the path (made printable) and says what to do;
 * callers at the edge (CLI, console, store) turn it into their own error without adding a stack.
 */

/** Why a file was refused; callers branch on this rather than on message text. */
export type FileRefusalCode =
	| 'not-found'
	| 'not-regular'
	| 'symbolic-link'
	| 'too-large'
	| 'exists'
	| 'changed'
	| 'not-owned'
	| 'encoding'
	| 'not-json'
	| 'json-refused'
	| 'unreadable'
	| 'unwritable';

export class FileRefusedError extends Error {
	constructor(
		readonly code: FileRefusalCode,
		message: string,
		/** The operating system's error code behind it (ENOSPC, EACCES, …), when there was one. */
		readonly errno?: string,
	) {
		super(message);
		this.name = 'FileRefusedError';
	}
}

/** The errno code of a Node file-system error, if any. */
export function errnoOf(error: unknown): string | undefined {
	const code = (error as NodeJS.ErrnoException | undefined)?.code;
	return typeof code === 'string' ? code : undefined;
}
