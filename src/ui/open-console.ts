/** Opens the interactive console (placeholder until the console lands). */
export async function openConsole(): Promise<void> {
	process.stdout.write('The console is not built yet; try `evenecho curve PLAN.json`.\n');
}
