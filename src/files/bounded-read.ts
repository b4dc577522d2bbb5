/**
 * The one way evenecho reads a whole input: plans, imports, stored presets, the settings file,
 * and (with their own cap) image files. Every read is capped, so a device, an endless pipe or a
 * growing file cannot exhaust memory, and nothing but a regular file is ever opened by name:
 * the kind is checked before opening, the file is opened non-blocking (a FIFO swapped in after the
 * check cannot stall the open) and checked again on the open descriptor. Standard input ("-") may
 * be a pipe or a device; it is read asynchronously, so Ctrl+C and SIGTERM keep working while it waits.
 */
import {
	closeSync,
	constants,
	createReadStream,
	fstatSync,
	lstatSync,
	openSync,
	readSync,
	statSync,
	type Stats,
} from 'node:fs';
import {FileRefusedError, errnoOf} from './file-errors.js';
import {describeKind} from './file-kind.js';
import {printable} from './printable.js';

/** Plan files, preset files, bundles and the settings file: all small text. */
export const maxPlanBytes = 1_000_000;
/** Image files (DICOM, PNG, JPEG): the image readers pass this as `maxBytes`. */
export const maxImageBytes = 64 * 1024 * 1024;

export interface ReadLimits {
	/** Most bytes accepted; one more means the input is refused as too large. */
	readonly maxBytes: number;
	/** Follow a symbolic link at the path (true for files the user names; false inside the store). @default true */
	readonly followLinks?: boolean;
	/** What the input is, for messages ("plan", "image"). @default 'file' */
	readonly what?: string;
	/** Whether to fingerprint the bytes (inode and SHA-256) for a later guarded change. @default true */
	readonly withIdentity?: boolean;
}

/** Who the file was when it was read: lets a later replace or delete check it is still the same. */
export interface FileIdentity {
	readonly dev: number;
	readonly ino: number;
	readonly size: number;
	readonly sha256: string;
}

export interface ReadFile {
	readonly bytes: Buffer;
	/** Undefined for standard input that is not a regular file. */
	readonly identity?: FileIdentity;
}

const noFollow = constants.O_NOFOLLOW ?? 0;
const nonBlocking = constants.O_NONBLOCK ?? 0;

/** Where an input came from, for messages. */
export function inputName(path: string): string {
	return path === '-' ? 'standard input' : printable(path);
}

export function identityOf(stat: Stats, bytes: Uint8Array): FileIdentity {
	// node:crypto is loaded on first use: commands that only read their input (`curve`) never need it.
	const {createHash} = process.getBuiltinModule('node:crypto');
	return {dev: stat.dev, ino: stat.ino, size: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex')};
}

function tooLarge(path: string, what: string, maxBytes: number, size?: number): FileRefusedError {
	const sizeText = size === undefined ? 'larger than' : `${size.toLocaleString('en-US')} bytes; over`;
	return new FileRefusedError(
		'too-large',
		`${inputName(path)}: the ${what} is ${sizeText} the limit of ${maxBytes.toLocaleString('en-US')} bytes`,
	);
}

function notRegular(path: string, what: string, stat: Stats): FileRefusedError {
	const code = stat.isSymbolicLink() ? 'symbolic-link' : 'not-regular';
	return new FileRefusedError(
		code,
		`${inputName(path)}: is ${describeKind(stat)}, not a regular file; give the ${what} as an ordinary file (or - for standard input)`,
	);
}

function cannotRead(path: string, what: string, error: unknown): FileRefusedError {
	const errno = errnoOf(error);
	if (errno === 'ENOENT') return new FileRefusedError('not-found', `${inputName(path)}: no such file`, errno);
	if (errno === 'ELOOP')
		return new FileRefusedError(
			'symbolic-link',
			`${inputName(path)}: is a symbolic link, which is not followed here`,
			errno,
		);
	return new FileRefusedError(
		'unreadable',
		`${inputName(path)}: cannot read the ${what}${errno ? ` (${errno})` : ''}`,
		errno,
	);
}

/**
 * Reads from an open descriptor until end of file or one byte past the cap. With the size the file
 * had when opened, the first read takes it whole and the end is confirmed with a small read, so a
 * large image is neither read in pieces nor copied again.
 */
function readCapped(fd: number, maxBytes: number, sizeHint = 0): {bytes: Buffer; overflow: boolean} {
	const chunks: Buffer[] = [];
	let total = 0;
	while (total <= maxBytes) {
		const want = total === 0 && sizeHint > 0 ? sizeHint + 1 : total > 0 && total === sizeHint ? 4096 : 1 << 20;
		const chunk = Buffer.allocUnsafe(Math.min(want, maxBytes + 1 - total));
		const n = readSync(fd, chunk, 0, chunk.length, null);
		if (n === 0) break;
		chunks.push(chunk.subarray(0, n));
		total += n;
	}
	const bytes = chunks.length === 1 ? chunks[0]! : Buffer.concat(chunks, total);
	return total > maxBytes ? {bytes: bytes.subarray(0, maxBytes), overflow: true} : {bytes, overflow: false};
}

/**
 * Reads a regular file whole, synchronously (a regular file cannot block indefinitely).
 * @throws FileRefusedError: missing, not a regular file (checked before opening), a link when
 *   `followLinks` is false, over the cap, or unreadable.
 */
export function readRegularFile(path: string, limits: ReadLimits): ReadFile {
	const what = limits.what ?? 'file';
	const follow = limits.followLinks !== false;
	let before: Stats;
	try {
		before = follow ? statSync(path) : lstatSync(path);
	} catch (error) {
		throw cannotRead(path, what, error);
	}
	if (!before.isFile()) throw notRegular(path, what, before);
	if (before.size > limits.maxBytes) throw tooLarge(path, what, limits.maxBytes, before.size);
	let fd: number;
	try {
		fd = openSync(path, constants.O_RDONLY | nonBlocking | (follow ? 0 : noFollow));
	} catch (error) {
		throw cannotRead(path, what, error);
	}
	try {
		const opened = fstatSync(fd);
		// Swapped between the check and the open: refuse rather than read something else.
		if (!opened.isFile()) throw notRegular(path, what, opened);
		if (opened.ino !== before.ino || opened.dev !== before.dev) {
			throw new FileRefusedError('changed', `${inputName(path)}: changed while being opened; try again`);
		}
		const {bytes, overflow} = readCapped(fd, limits.maxBytes, opened.size);
		if (overflow) throw tooLarge(path, what, limits.maxBytes);
		return limits.withIdentity === false ? {bytes} : {bytes, identity: identityOf(opened, bytes)};
	} catch (error) {
		if (error instanceof FileRefusedError) throw error;
		throw cannotRead(path, what, error);
	} finally {
		closeSync(fd);
	}
}

/** Standard input, capped; asynchronous unless it is a regular file (a redirect from a file). */
async function readStandardInput(limits: ReadLimits): Promise<ReadFile> {
	const what = limits.what ?? 'file';
	let stat: Stats | undefined;
	try {
		stat = fstatSync(0);
	} catch {
		stat = undefined;
	}
	if (stat?.isFile()) {
		if (stat.size > limits.maxBytes) throw tooLarge('-', what, limits.maxBytes, stat.size);
		const {bytes, overflow} = readCapped(0, limits.maxBytes);
		if (overflow) throw tooLarge('-', what, limits.maxBytes);
		return {bytes};
	}
	// Pipes, terminals and devices: read on the thread pool so the event loop (and with it every
	// signal handler) stays free however long the writer takes.
	return new Promise<ReadFile>((resolve, reject) => {
		const stream = createReadStream('', {fd: 0, autoClose: false, highWaterMark: 1 << 16});
		const chunks: Buffer[] = [];
		let total = 0;
		stream.on('data', (chunk) => {
			const buffer = chunk as Buffer;
			total += buffer.length;
			if (total > limits.maxBytes) {
				stream.destroy();
				reject(tooLarge('-', what, limits.maxBytes));
				return;
			}
			chunks.push(buffer);
		});
		stream.on('error', (error) => reject(cannotRead('-', what, error)));
		stream.on('end', () => resolve({bytes: Buffer.concat(chunks, total)}));
	});
}

/** A file the user named, or standard input for "-": the same checks and cap either way. */
export async function readInput(path: string, limits: ReadLimits): Promise<ReadFile> {
	return path === '-' ? readStandardInput(limits) : readRegularFile(path, limits);
}
