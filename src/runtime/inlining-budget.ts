/**
 * A smaller inlining budget for V8's optimising compiler during a protocol table.
 *
 * A table runs the engine on two threads (two V8 isolates), and each compiles the hot code it runs
 * for itself; on a 10,000-row table that compiling was about a quarter of the CPU time, much of it
 * spent on functions that inline others whole (the fit's solvers, the path model). Inlining only
 * callees of at most 150 bytes of bytecode (V8's default is 460) made the table ~10 % faster in wall
 * time, alternated runs side by side on a 2-core machine (6 pairs, every pair faster), with the same
 * speed once compiled: less to compile, nothing slower to run. The flag is the process's, so the
 * worker threads started after this share it; it is read at each compilation, so it applies to
 * whatever is compiled from now on.
 */
import {setFlagsFromString} from 'node:v8';

/** Largest callee, bytes of bytecode, that the optimising compiler inlines from now on. */
const maxInlinedBytecodeSize = 150;

export function limitInlining(): void {
	setFlagsFromString(`--max-inlined-bytecode-size=${maxInlinedBytecodeSize}`);
}
