/**
 * The precompiled curve script (see src/runtime/precompiled-script.ts): src/cli/curve-script.ts as
 * one minified CommonJS file beside the module bundle. Of the lazy imports of the command list and
 * the program, only the `curve` command's is kept; the other commands and the console are never
 * loaded on a `curve` command line, and load here as a module that says so.
 */
import {isBuiltin} from 'node:module';
import {defineConfig} from 'rolldown';
import {moduleWrapperEnd, moduleWrapperStart} from './src/runtime/precompiled-script.js';
import {commanderWithoutChildProcess} from './tools/commander-without-child-process.js';

const leftOut = '\0left-out-of-curve-script:';
const onFirstUse = '\0node-built-in-on-first-use:';

export default defineConfig({
	input: 'src/cli/curve-script.ts',
	platform: 'node',
	external: ['react-devtools-core'],
	transform: {jsx: 'react-jsx', define: {'process.env.NODE_ENV': '"production"'}},
	logLevel: 'warn',
	plugins: [
		commanderWithoutChildProcess,
		{
			name: 'curve-command-only',
			resolveDynamicImport(specifier, importer) {
				if (typeof specifier !== 'string' || !/[/\\]src[/\\]cli[/\\](command-list|program)\.ts$/.test(importer ?? ''))
					return null;
				return specifier === './curve-command.js' ? null : `${leftOut}${specifier}`;
			},
			load(id) {
				if (!id.startsWith(leftOut)) return null;
				return `throw new Error(${JSON.stringify(`${id.slice(leftOut.length)} is not part of the curve script`)});`;
			},
		},
		{
			// A CommonJS bundle requires every Node built-in it imports at its top, the store's crypto, os,
			// child_process and assert with them, though only a plan naming a scanner reaches the store:
			// each built-in becomes a small CommonJS module, required when its first importer runs.
			name: 'built-ins-on-first-use',
			resolveId(source, importer) {
				if (!isBuiltin(source) || importer?.startsWith(onFirstUse)) return null;
				return `${onFirstUse}${source}`;
			},
			load(id) {
				if (!id.startsWith(onFirstUse)) return null;
				return `module.exports = require(${JSON.stringify(id.slice(onFirstUse.length))});`;
			},
		},
	],
	output: {
		file: 'dist/bundle/curve-script.cjs',
		format: 'cjs',
		codeSplitting: false,
		minify: true,
		charset: 'ascii',
		// Wrapped as Node's loader wraps a module, in the file itself: V8 then compiles the text as read,
		// rather than a joined copy it must first flatten (450 kB of fresh memory, dear on this machine).
		postBanner: moduleWrapperStart,
		postFooter: moduleWrapperEnd,
	},
});
