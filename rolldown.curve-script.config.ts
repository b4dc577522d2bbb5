/**
 * The precompiled curve script (see src/runtime/precompiled-script.ts): src/cli/curve-script.ts as
 * one minified CommonJS file beside the module bundle. Of the lazy imports of the command list and
 * the program, only the `curve` command's is kept; the other commands and the console are never
 * loaded on a `curve` command line, and load here as a module that says so.
 */
import {defineConfig} from 'rolldown';

const leftOut = '\0left-out-of-curve-script:';

export default defineConfig({
	input: 'src/cli/curve-script.ts',
	platform: 'node',
	external: ['react-devtools-core'],
	transform: {jsx: 'react-jsx', define: {'process.env.NODE_ENV': '"production"'}},
	logLevel: 'warn',
	plugins: [
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
	],
	output: {file: 'dist/bundle/curve-script.cjs', format: 'cjs', codeSplitting: false, minify: true},
});
