#!/usr/bin/env node
/**
 * The `evenecho` command. With no arguments it opens the console; the sub-commands are the batch
 * side and never prompt. `curve` runs from the precompiled curve script when the build made one
 * (it starts faster, see runtime/precompiled-script.ts), everything else from the modules.
 */
import {fileURLToPath} from 'node:url';
import {commandNamed} from './command-list.js';
import {runCommandLine} from './command-line.js';
import {runPrecompiledScript} from '../runtime/precompiled-script.js';

const precompiled =
	commandNamed(process.argv.slice(2))?.name === 'curve'
		? runPrecompiledScript(fileURLToPath(new URL('./curve-script.cjs', import.meta.url)))
		: undefined;
const run = (precompiled?.['runCommandLine'] as typeof runCommandLine | undefined) ?? runCommandLine;
await run(process.argv);
