import {defineConfig} from 'vitest/config';

export default defineConfig({
	test: {
		include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
		setupFiles: ['test/setup.ts'],
		testTimeout: 60_000,
		// Upper bounds, not speed targets (those live in npm run bench): on two cores shared with other
		// work, a test that spawns the CLI a dozen times or imports Ink can take a minute.
		hookTimeout: 60_000,
	},
});
