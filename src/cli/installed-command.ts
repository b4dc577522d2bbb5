/**
 * The installed command (package.json "bin", built to dist/bundle/evenecho.cjs). A CommonJS file,
 * so a `curve` command line runs the precompiled curve script without Node ever starting its ES
 * module loader (measured: `curve` 2.04× → 1.81× `node -e 0` in CPU); every other command line,
 * and `curve` when the build made no script, loads the module bundle's main.js as before.
 */
import {join} from 'node:path';
import {pathToFileURL} from 'node:url';
import {runPrecompiledScript} from '../runtime/precompiled-script.js';
import {commandWord} from './command-word.js';

type RunCommandLine = (argv: readonly string[]) => Promise<void>;

const curve =
	commandWord(process.argv.slice(2)) === 'curve'
		? runPrecompiledScript(join(__dirname, 'curve-script.cjs'))
		: undefined;
const run = curve?.['runCommandLine'] as RunCommandLine | undefined;
if (run) void run(process.argv);
else void import(pathToFileURL(join(__dirname, 'main.js')).href);
