/**
 * JSON from outside (plans, imports, stored presets, the store's settings), parsed one way
 * everywhere. Beyond JSON.parse it refuses what JSON.parse silently accepts or what could hurt
 * later: a key given twice in one object (JSON.parse keeps the last; we name the key), keys that
 * reach an object prototype, nesting deeper than any of our formats, and text with characters the
 * text-field rule refuses (checked here for every string and key, whatever the schema says).
 */
import {printable} from './printable.js';
import {findUnsafeCharacter} from './text-field.js';

/** Our formats nest six levels at most; sixteen leaves room and stops stack-hungry files. */
export const maxJsonDepth = 16;
const forbiddenKeys = new Set(['__proto__', 'constructor', 'prototype']);

/** `syntax`: not JSON at all (a damaged file); `refused`: JSON, but breaking one of the rules above. */
export type StrictJson = {ok: true; value: unknown} | {ok: false; kind: 'syntax' | 'refused'; problem: string};

function pathText(path: readonly string[]): string {
	return path.length ? path.map((p) => printable(p, 60)).join('.') : '(top)';
}

export function parseStrictJson(text: string): StrictJson {
	let value: unknown;
	try {
		value = JSON.parse(text) as unknown;
	} catch (error) {
		// V8 quotes the text around the fault: show it, but never raw.
		return {ok: false, kind: 'syntax', problem: `not valid JSON (${printable((error as Error).message, 160)})`};
	}
	const problem = scanKeys(text) ?? checkValues(value);
	return problem ? {ok: false, kind: 'refused', problem} : {ok: true, value};
}

interface Frame {
	readonly isObject: boolean;
	readonly keys: Set<string>;
	readonly path: string[];
	index: number;
	key: string | undefined;
	expectKey: boolean;
}

/**
 * Walks already-valid JSON text once, keeping the keys of each open object, to find a repeated
 * key and report where. Strings are decoded with JSON.parse so escapes compare as their meaning.
 */
function scanKeys(text: string): string | undefined {
	const stack: Frame[] = [];
	const childPath = (): string[] => {
		const top = stack.at(-1);
		if (!top) return [];
		return [...top.path, top.isObject ? (top.key ?? '') : String(top.index)];
	};
	for (let i = 0; i < text.length; i++) {
		const c = text[i]!;
		if (c === '{' || c === '[') {
			const path = childPath();
			if (stack.length >= maxJsonDepth) return `${pathText(path)}: nested deeper than ${maxJsonDepth} levels`;
			stack.push({isObject: c === '{', keys: new Set(), path, index: 0, key: undefined, expectKey: c === '{'});
		} else if (c === '}' || c === ']') {
			stack.pop();
		} else if (c === ',') {
			const top = stack.at(-1);
			if (top?.isObject) top.expectKey = true;
			else if (top) top.index++;
		} else if (c === '"') {
			let end = i + 1;
			while (text[end] !== '"') end += text[end] === '\\' ? 2 : 1;
			const top = stack.at(-1);
			if (top?.isObject && top.expectKey) {
				const key = JSON.parse(text.slice(i, end + 1)) as string;
				if (top.keys.has(key))
					return `${pathText(top.path)}: the key "${printable(key, 60)}" appears more than once; keep one`;
				top.keys.add(key);
				top.key = key;
				top.expectKey = false;
			}
			i = end;
		}
	}
	return undefined;
}

/** Forbidden keys and unsafe text, depth first with an explicit stack. */
function checkValues(root: unknown): string | undefined {
	const stack: Array<{value: unknown; path: string[]}> = [{value: root, path: []}];
	while (stack.length) {
		const {value, path} = stack.pop()!;
		if (typeof value === 'string') {
			const found = findUnsafeCharacter(value, {multiline: true});
			if (found)
				return `${pathText(path)}: contains a control or invisible formatting character (${found}), which text here may not hold`;
			continue;
		}
		if (value === null || typeof value !== 'object') continue;
		const entries: Array<[string, unknown]> = Array.isArray(value)
			? value.map((v, i) => [String(i), v])
			: Object.entries(value);
		for (const [key, child] of entries) {
			if (!Array.isArray(value)) {
				if (forbiddenKeys.has(key)) return `${pathText([...path, key])}: the key "${key}" is not allowed`;
				const found = findUnsafeCharacter(key);
				if (found) return `${pathText(path)}: a key contains a control or invisible formatting character (${found})`;
			}
			stack.push({value: child, path: [...path, key]});
		}
	}
	return undefined;
}
