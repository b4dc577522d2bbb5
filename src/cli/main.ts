/**
 * The `evenecho` command's module entry, loaded by the installed command (installed-command.ts)
 * for every command line it does not run from the precompiled curve script. With no arguments it
 * opens the console; the sub-commands are the batch side and never prompt.
 */
import {runCommandLine} from './command-line.js';

await runCommandLine(process.argv);
