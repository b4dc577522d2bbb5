/**
 * Entry of the precompiled curve script (dist/bundle/curve-script.cjs, see
 * runtime/precompiled-script.ts): the same command line as main.ts runs, built as one CommonJS
 * script with the `curve` command and everything it loads; the other commands and the console are
 * left out of it, so the installed command runs only `curve` command lines through it.
 */
export {runCommandLine} from './command-line.js';
