/**
 * `npm run bench`: every benchmark in one run, each printing its measurements and ratios.
 * Targets are printed beside the numbers; nothing here fails a build.
 */
const suites = ['./curve-bench.js', './console-bench.js', './table-bench.js'];

for (const path of suites) {
	try {
		const suite = (await import(path)) as {run: () => Promise<void>};
		await suite.run();
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		if (code === 'ERR_MODULE_NOT_FOUND') console.log(`(${path} not present)`);
		else throw error;
	}
}
