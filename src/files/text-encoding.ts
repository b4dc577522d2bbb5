/**
 * Bytes from a file to text, the same way at every door: UTF-8, with or without a byte-order
 * mark (the mark is dropped). UTF-16 and UTF-32 files, marked or not, are refused with the
 * encoding named and what to save instead, never echoed as raw bytes; so is invalid UTF-8.
 */

export type DecodedText = {ok: true; text: string} | {ok: false; problem: string};

const utf8 = new TextDecoder('utf-8', {fatal: true, ignoreBOM: true});

function startsWith(bytes: Uint8Array, prefix: readonly number[]): boolean {
	return prefix.every((b, i) => bytes[i] === b);
}

/** Which wide encoding the bytes look like, judged by a byte-order mark or by zero bytes. */
function wideEncoding(bytes: Uint8Array): string | undefined {
	if (startsWith(bytes, [0xff, 0xfe, 0, 0])) return 'UTF-32 (little-endian)';
	if (startsWith(bytes, [0, 0, 0xfe, 0xff])) return 'UTF-32 (big-endian)';
	if (startsWith(bytes, [0xff, 0xfe])) return 'UTF-16 (little-endian)';
	if (startsWith(bytes, [0xfe, 0xff])) return 'UTF-16 (big-endian)';
	// Unmarked: JSON starts with ASCII, so a zero byte beside the first character gives it away.
	if (bytes.length >= 2 && bytes[0] !== 0 && bytes[1] === 0) return 'UTF-16 (little-endian, no byte-order mark)';
	if (bytes.length >= 2 && bytes[0] === 0 && bytes[1] !== 0) return 'UTF-16 (big-endian, no byte-order mark)';
	return undefined;
}

const saveAs = 'save it as UTF-8 (most editors offer "UTF-8" in their save or encoding menu)';

export function decodeText(bytes: Uint8Array): DecodedText {
	const wide = wideEncoding(bytes);
	if (wide) return {ok: false, problem: `is ${wide} text; evenecho reads UTF-8 only: ${saveAs}`};
	const body = startsWith(bytes, [0xef, 0xbb, 0xbf]) ? bytes.subarray(3) : bytes;
	try {
		return {ok: true, text: utf8.decode(body)};
	} catch {
		return {ok: false, problem: `is not UTF-8 text (it holds bytes that are not valid UTF-8); ${saveAs}`};
	}
}
