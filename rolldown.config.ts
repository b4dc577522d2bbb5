/**
 * The module bundle (dist/bundle): the `evenecho` command and the table's worker thread, with
 * React's production build. Was a command line of flags; a config file since it takes a plugin.
 */
import {defineConfig} from 'rolldown';
import {commanderWithoutChildProcess} from './tools/commander-without-child-process.js';

export default defineConfig({
	input: ['src/cli/main.ts', 'src/table/sweep-worker.ts'],
	platform: 'node',
	external: ['react-devtools-core'],
	transform: {jsx: 'react-jsx', define: {'process.env.NODE_ENV': '"production"'}},
	logLevel: 'warn',
	plugins: [commanderWithoutChildProcess],
	output: {dir: 'dist/bundle', format: 'esm', minify: true, cleanDir: true},
});
