/**
 * `npm run bench`: every benchmark in one run, each printing its measurements, ✓ or ✗ beside each
 * target, and a closing list of every target. Nothing here fails a build. The yardstick for
 * "× faster than before" is an earlier commit compiled into a temp folder (see pinned-build.ts).
 * `npm run bench -- curve table` runs only the named suites.
 */
import {summary} from './bench-tools.js';
import {pinnedBuild} from './pinned-build.js';

const suites = {
	startup: './startup-bench.js',
	curve: './curve-bench.js',
	console: './console-bench.js',
	table: './table-bench.js',
	picture: './picture-bench.js',
	scanner: './scanner-bench.js',
	refine: './refine-bench.js',
} as const;

const asked = process.argv.slice(2).filter((a): a is keyof typeof suites => a in suites);
const pinned = pinnedBuild();
console.log(`yardstick: pinned build ${pinned.commit} (${pinned.distDir})`);
for (const [name, path] of Object.entries(suites)) {
	if (asked.length && !asked.includes(name as keyof typeof suites)) continue;
	const suite = (await import(path)) as {run: (p: typeof pinned) => Promise<void>};
	await suite.run(pinned);
}
summary();
