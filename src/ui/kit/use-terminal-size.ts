/** Columns and rows of the terminal, following resizes; fixed values win (tests, the bench). */
import {useStdout} from 'ink';
import {useEffect, useState} from 'react';

export interface TerminalSize {
	readonly columns: number;
	readonly rows: number;
}

export function useTerminalSize(fixed: Partial<TerminalSize> = {}): TerminalSize {
	const {stdout} = useStdout();
	const read = (): TerminalSize => ({
		columns: fixed.columns ?? (stdout.columns || 80),
		rows: fixed.rows ?? (stdout.rows || 24),
	});
	const [size, setSize] = useState(read);
	// biome-ignore lint/correctness/useExhaustiveDependencies: read() is rebuilt each render from exactly these inputs
	useEffect(() => {
		const onResize = () => setSize(read());
		stdout.on('resize', onResize);
		return () => {
			stdout.off('resize', onResize);
		};
	}, [stdout, fixed.columns, fixed.rows]);
	return fixed.columns !== undefined || fixed.rows !== undefined ? read() : size;
}
