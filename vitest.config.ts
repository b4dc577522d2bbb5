import {defineConfig} from 'vitest/config';

export default defineConfig({
	test: {
		include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
		setupFiles: ['test/setup.ts'],
		testTimeout: 20_000,
		// Hooks import Ink and the app; on two busy cores that can take as long as a test.
		hookTimeout: 20_000,
	},
});
