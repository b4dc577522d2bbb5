/**
 * The import graph of src/, read with TypeScript's own pre-processor, so every form counts: static
 * imports and re-exports in any quotes, `import type`, dynamic `import()` and `require()`.
 */
import {readdirSync, readFileSync, statSync} from 'node:fs';
import {dirname, join, relative, resolve} from 'node:path';
import {fileURLToPath} from 'node:url';
import ts from 'typescript';

export const srcRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', 'src');

export interface SourceFile {
	/** Path under src/, with forward slashes: `ui/state/console-state.ts`. */
	readonly path: string;
	/** The folder under src/: `ui/state`, `engine`; `ui` for the files at the root of src/ui. */
	readonly folder: string;
	/** Bare module names as written (`ink`, `node:fs`, `zod`). */
	readonly packages: readonly string[];
	/** Other src files this one imports, as paths under src/. */
	readonly locals: readonly string[];
	readonly text: string;
}

function walk(dir: string): string[] {
	return readdirSync(dir).flatMap((name) => {
		const path = join(dir, name);
		return statSync(path).isDirectory() ? walk(path) : [path];
	});
}

/** `./x.js` → the .ts or .tsx file it names (NodeNext spelling), or the path as written. */
function resolveLocal(fromFile: string, spec: string): string {
	const target = resolve(dirname(fromFile), spec);
	for (const candidate of [target.replace(/\.js$/, '.ts'), target.replace(/\.js$/, '.tsx'), target]) {
		try {
			if (statSync(candidate).isFile()) return candidate;
		} catch {
			// try the next spelling
		}
	}
	return target;
}

/** Every import specifier in a file's text, in any form. */
export function importSpecifiers(text: string): string[] {
	return ts.preProcessFile(text, true, true).importedFiles.map((f) => f.fileName);
}

export function readSourceFiles(root = srcRoot): SourceFile[] {
	return walk(root)
		.filter((f) => /\.(ts|tsx)$/.test(f))
		.map((file) => {
			const text = readFileSync(file, 'utf8');
			const specs = importSpecifiers(text);
			const path = relative(root, file).split('\\').join('/');
			return {
				path,
				folder: dirname(path),
				packages: specs.filter((s) => !s.startsWith('.')),
				locals: specs
					.filter((s) => s.startsWith('.'))
					.map((s) => relative(root, resolveLocal(file, s)).split('\\').join('/')),
				text,
			};
		});
}

/** Files reachable from `starts` through local imports (the starts included). */
export function reachable(files: readonly SourceFile[], starts: readonly SourceFile[]): SourceFile[] {
	const byPath = new Map(files.map((f) => [f.path, f]));
	const seen = new Map<string, SourceFile>();
	const stack = [...starts];
	while (stack.length) {
		const f = stack.pop()!;
		if (seen.has(f.path)) continue;
		seen.set(f.path, f);
		for (const l of f.locals) {
			const next = byPath.get(l);
			if (next) stack.push(next);
		}
	}
	return [...seen.values()];
}

/** Import loops between files: each strongly connected group of two or more (or a file importing itself). */
export function importLoops(files: readonly SourceFile[]): string[][] {
	const byPath = new Map(files.map((f) => [f.path, f]));
	let counter = 0;
	const index = new Map<string, number>();
	const low = new Map<string, number>();
	const onStack = new Set<string>();
	const stack: string[] = [];
	const loops: string[][] = [];
	const visit = (p: string): void => {
		index.set(p, counter);
		low.set(p, counter);
		counter++;
		stack.push(p);
		onStack.add(p);
		for (const q of byPath.get(p)?.locals ?? []) {
			if (!byPath.has(q)) continue;
			if (!index.has(q)) {
				visit(q);
				low.set(p, Math.min(low.get(p)!, low.get(q)!));
			} else if (onStack.has(q)) {
				low.set(p, Math.min(low.get(p)!, index.get(q)!));
			}
		}
		if (low.get(p) === index.get(p)) {
			const group: string[] = [];
			let q: string;
			do {
				q = stack.pop()!;
				onStack.delete(q);
				group.push(q);
			} while (q !== p);
			if (group.length > 1 || byPath.get(p)!.locals.includes(p)) loops.push(group.sort());
		}
	};
	for (const f of files) if (!index.has(f.path)) visit(f.path);
	return loops;
}

/** Whether the code (not its comments or strings) reads the `process` global. */
export function readsProcess(text: string): boolean {
	const scanner = ts.createScanner(ts.ScriptTarget.Latest, true, ts.LanguageVariant.JSX, text);
	let previous = '';
	for (let token = scanner.scan(); token !== ts.SyntaxKind.EndOfFileToken; token = scanner.scan()) {
		if (token === ts.SyntaxKind.DotToken && previous === 'process') return true;
		previous = token === ts.SyntaxKind.Identifier ? scanner.getTokenValue() : '';
	}
	return false;
}
