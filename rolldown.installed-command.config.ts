/**
 * The installed command's first file (src/cli/installed-command.ts) as CommonJS, beside the module
 * bundle: dist/bundle/evenecho.cjs, what package.json "bin" points at. main.js is left to Node's
 * module loader (imported at run time, never bundled in here).
 */
import {defineConfig} from 'rolldown';

export default defineConfig({
	input: 'src/cli/installed-command.ts',
	platform: 'node',
	logLevel: 'warn',
	output: {
		file: 'dist/bundle/evenecho.cjs',
		format: 'cjs',
		codeSplitting: false,
		minify: true,
		banner: '#!/usr/bin/env node',
	},
});
