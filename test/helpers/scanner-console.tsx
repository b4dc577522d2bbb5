/**
 * The console with a measured-scanner store, for the scanner panel's keystroke tests. The modules
 * are imported inside the caller's beforeAll (with its long timeout): Ink and the readers take a
 * while to load on a busy machine.
 */
export interface ScannerConsole {
	readonly render: typeof import('ink-testing-library').render;
	readonly App: typeof import('../../src/ui/app.js').App;
	readonly openShelf: typeof import('../../src/ui/effects/preset-shelf.js').openShelf;
	readonly services: typeof import('../../src/ui/effects/scanner-services.js');
	readonly store: typeof import('../../src/store/scanner-profile-store.js');
	readonly theme: typeof import('../../src/ui/kit/theme.js');
	readonly press: typeof import('./press.js');
}

export async function loadScannerConsole(): Promise<ScannerConsole> {
	return {
		render: (await import('ink-testing-library')).render,
		App: (await import('../../src/ui/app.js')).App,
		openShelf: (await import('../../src/ui/effects/preset-shelf.js')).openShelf,
		services: await import('../../src/ui/effects/scanner-services.js'),
		store: await import('../../src/store/scanner-profile-store.js'),
		theme: await import('../../src/ui/kit/theme.js'),
		press: await import('./press.js'),
	};
}

/** Opens the console on the demo plan with its preset and scanner stores in `home`, ready for keys. */
export async function openScannerConsole(lib: ScannerConsole, home: string, columns = 100, rows = 30) {
	const {render, App, openShelf, services, store, theme, press} = lib;
	const scanners = services.scannerServicesOver(() => store.openScannerProfileStore(home));
	const app = render(
		<App shelf={openShelf({home})} scanners={scanners} theme={theme.plainTheme} columns={columns} rows={rows} />,
	);
	await press.ready(app);
	return app;
}
