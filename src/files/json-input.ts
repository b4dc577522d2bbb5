/**
 * A JSON document from outside, read the one way: bounded read (regular files only, or standard
 * input for "-"), UTF-8 decoding (byte-order mark allowed), strict parsing (duplicate keys named,
 * prototype keys, depth and unsafe text refused). Plans, imports, stored records and the settings
 * file all come through here, so a file accepted by one door is accepted by every other.
 */
import {inputName, readInput, readRegularFile, type FileIdentity, type ReadLimits} from './bounded-read.js';
import {FileRefusedError} from './file-errors.js';
import {parseStrictJson} from './strict-json.js';
import {decodeText} from './text-encoding.js';

export interface JsonDocument {
	readonly value: unknown;
	/** The decoded text (for a damaged-file backup check). */
	readonly text: string;
	readonly identity?: FileIdentity;
}

/** Decodes and parses bytes already read; `path` only names the input in messages. */
export function parseJsonBytes(path: string, bytes: Uint8Array, identity?: FileIdentity): JsonDocument {
	const decoded = decodeText(bytes);
	if (!decoded.ok) throw new FileRefusedError('encoding', `${inputName(path)}: ${decoded.problem}`);
	const parsed = parseStrictJson(decoded.text);
	if (!parsed.ok)
		throw new FileRefusedError(
			parsed.kind === 'syntax' ? 'not-json' : 'json-refused',
			`${inputName(path)}: ${parsed.problem}`,
		);
	return {value: parsed.value, text: decoded.text, ...(identity ? {identity} : {})};
}

/** A file the user named, or standard input for "-". @throws FileRefusedError */
export async function readJsonInput(path: string, limits: ReadLimits): Promise<JsonDocument> {
	const read = await readInput(path, limits);
	return parseJsonBytes(path, read.bytes, read.identity);
}

/** A regular file, synchronously (store records, templates, settings). @throws FileRefusedError */
export function readJsonFile(path: string, limits: ReadLimits): JsonDocument {
	const read = readRegularFile(path, limits);
	return parseJsonBytes(path, read.bytes, read.identity);
}
