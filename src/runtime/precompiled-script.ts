/**
 * A CommonJS script run with V8's code cache. Node 20 compiles every ES module from its source on
 * every start and has no compile cache of its own, so the `curve` command also ships as one script
 * (dist/bundle/curve-script.cjs) whose compiled code the build stores beside it: started from the
 * cache, V8 neither parses the script nor compiles the functions the build's run compiled.
 *
 * The cache is only ever read here. When it is missing, or V8 rejects it (another Node or V8
 * version, other V8 flags, a script of another length), V8 compiles the source as usual.
 */
import {readFileSync} from 'node:fs';
import {createRequire} from 'node:module';
import {dirname} from 'node:path';
import type {Script} from 'node:vm';

/** The code cache file of a script. */
export function codeCachePath(scriptPath: string): string {
	return `${scriptPath}.v8-cache`;
}

export interface CompiledScript {
	readonly script: Script;
	/** Runs the script's top level once and returns its exports. */
	run(): Record<string, unknown>;
}

/** How the script's file begins and ends: a CommonJS module body wrapped as Node's loader wraps one. */
export const moduleWrapperStart = '(function (exports, require, module, __filename, __dirname) {';
export const moduleWrapperEnd = '\n})';

/**
 * Compiles a script file (already wrapped, see moduleWrapperStart) from `cachedData` if V8 accepts it.
 * The text goes to V8 as read: a joined copy would cost V8 a flattening copy first.
 */
export function compileScript(path: string, source: string, cachedData?: Buffer): CompiledScript {
	// node:vm loaded here, not at the top: the installed command imports this file for every command
	// line, and only `curve` compiles a script (measured: --version and --help 1.33× node -e 0 with it at the top).
	const {constants, Script} = process.getBuiltinModule('node:vm');
	const script = new Script(source, {
		filename: path,
		...(cachedData ? {cachedData} : {}),
		importModuleDynamically: constants.USE_MAIN_CONTEXT_DEFAULT_LOADER,
	});
	return {
		script,
		run() {
			const module = {exports: {} as Record<string, unknown>};
			script.runInThisContext()(module.exports, createRequire(path), module, path, dirname(path));
			return module.exports;
		},
	};
}

/** A script's exports, run from its code cache when there is one; undefined when the script is not there. */
export function runPrecompiledScript(path: string): Record<string, unknown> | undefined {
	let source: string;
	try {
		source = readFileSync(path, 'utf8');
	} catch {
		return undefined;
	}
	let cachedData: Buffer | undefined;
	try {
		cachedData = readFileSync(codeCachePath(path));
	} catch {
		// No cache: compiled from the source.
	}
	return compileScript(path, source, cachedData).run();
}
