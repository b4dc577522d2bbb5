/** Rounds to fixed decimals (what the table formats print and the console's fields step by); never returns −0. */
export function roundTo(x: number, decimals: number): number {
	const v = Number(x.toFixed(decimals));
	return v === 0 ? 0 : v;
}
