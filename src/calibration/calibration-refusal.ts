/** Why a calibration cannot be made: names the session field at fault and the reason. */
export class CalibrationRefusal extends Error {
	constructor(
		readonly field: string,
		problem: string,
	) {
		super(`${field}: ${problem}`);
		this.name = 'CalibrationRefusal';
	}
}
