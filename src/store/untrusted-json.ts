/**
 * Reading JSON the program did not write itself (imports, hand-edited preset files): bounded in
 * size and nesting, refusing keys that could reach an object prototype if anything downstream
 * ever merged the data into another object, and refusing text that could drive a terminal.
 */
import {closeSync, fstatSync, openSync, readSync} from 'node:fs';

/** Preset files and bundles are small; anything bigger is not one. */
export const maxPresetFileBytes = 1_000_000;
/** Plans nest four levels deep; bundles add two. */
export const maxJsonDepth = 16;
// Keys that reach an object's prototype when data is merged or assigned into another object.
const forbiddenKeys = new Set(['__proto__', 'constructor', 'prototype']);
// Text is printed to terminals: no control characters (tab and line breaks aside) and no bidi
// overrides, which could rewrite the screen or disguise what a name says.
const unsafeText = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/u;

/** `syntax`: not JSON at all (a damaged file); `hostile`: JSON, but with a forbidden key or nesting. */
export type JsonCheck = {ok: true; value: unknown} | {ok: false; kind: 'syntax' | 'hostile'; problem: string};

/**
 * Reads at most `maxBytes` (+1 to detect overflow) from a file or, for "-", standard input. Reading
 * is bounded itself, so a device or a growing file cannot exhaust memory.
 */
export function readBoundedText(path: string, maxBytes = maxPresetFileBytes): {ok: true; text: string} | {ok: false; problem: string; code?: string} {
	let fd: number;
	try {
		fd = path === '-' ? 0 : openSync(path, 'r');
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		return {ok: false, problem: `cannot read the file${code ? ` (${code})` : ''}`, ...(code ? {code} : {})};
	}
	try {
		if (path !== '-') {
			const stat = fstatSync(fd);
			if (stat.isDirectory()) return {ok: false, problem: 'is a directory, not a file', code: 'EISDIR'};
			if (stat.isFile() && stat.size > maxBytes) return {ok: false, problem: `is ${stat.size} bytes; the limit is ${maxBytes}`};
		}
		// Chunks rather than one buffer of the limit's size: listing reads many small files.
		const chunks: Buffer[] = [];
		let total = 0;
		while (total <= maxBytes) {
			const chunk = Buffer.alloc(Math.min(65_536, maxBytes + 1 - total));
			let n: number;
			try {
				n = readSync(fd, chunk, 0, chunk.length, null);
			} catch (error) {
				if ((error as NodeJS.ErrnoException).code === 'EAGAIN') continue;
				throw error;
			}
			if (n === 0) break;
			chunks.push(chunk.subarray(0, n));
			total += n;
		}
		if (total > maxBytes) return {ok: false, problem: `is larger than the limit of ${maxBytes} bytes`};
		return {ok: true, text: Buffer.concat(chunks, total).toString('utf8').replace(/^\uFEFF/, '')};
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		return {ok: false, problem: `cannot read the file${code ? ` (${code})` : ''}`, ...(code ? {code} : {})};
	} finally {
		if (path !== '-') closeSync(fd);
	}
}

/** Parses JSON and checks it for forbidden keys, terminal control text and excessive nesting; the problem names the path. */
export function parseUntrustedJson(text: string): JsonCheck {
	let value: unknown;
	try {
		value = JSON.parse(text) as unknown;
	} catch (error) {
		return {ok: false, kind: 'syntax', problem: `not valid JSON (${(error as Error).message})`};
	}
	const problem = findHostileKey(value);
	return problem ? {ok: false, kind: 'hostile', problem} : {ok: true, value};
}

/** Depth-first walk with an explicit stack, so a deeply nested file cannot overflow ours. */
function findHostileKey(root: unknown): string | undefined {
	const stack: Array<{value: unknown; path: string; depth: number}> = [{value: root, path: '', depth: 0}];
	while (stack.length) {
		const {value, path, depth} = stack.pop()!;
		if (typeof value === 'string' && unsafeText.test(value)) return `${path || '(top)'}: contains control characters, which are not allowed in text`;
		if (value === null || typeof value !== 'object') continue;
		if (depth >= maxJsonDepth) return `${path || '(top)'}: nested deeper than ${maxJsonDepth} levels`;
		const entries: Array<[string, unknown]> = Array.isArray(value) ? value.map((v, i) => [String(i), v]) : Object.entries(value);
		for (const [key, child] of entries) {
			const childPath = path ? `${path}.${key}` : key;
			if (!Array.isArray(value) && forbiddenKeys.has(key)) return `${childPath}: the key "${key}" is not allowed`;
			if (unsafeText.test(key)) return `${path || '(top)'}: a key contains control characters`;
			stack.push({value: child, path: childPath, depth: depth + 1});
		}
	}
	return undefined;
}
