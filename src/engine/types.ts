/**
 * Plain data types shared by the whole compensation engine.
 *
 * Units are in the names: cm, MHz, dB, m/s, kg/m³. Attenuation coefficients are always
 * ONE-WAY (dB/cm at 1 MHz, α(f) = α0·fⁿ); the engine doubles them for the echo's round trip.
 * The engine never validates: the plan schema (src/plan) does that at the boundary.
 */

/** A closed interval [low, high]. */
export type Range = readonly [low: number, high: number];

/** Literature spread of one tissue's values, used for the uncertainty band. */
export interface TissueSpread {
	readonly speedMps?: Range;
	readonly densityKgM3?: Range;
	readonly alphaDbPerCmMhz?: Range;
	readonly exponent?: Range;
}

/**
 * What the probe listens to:
 * - `fundamental`: the echo at the transmit band;
 * - `tissue-harmonic`: the second harmonic the tissue itself builds up on the way down (quasi-linear
 *   plane-wave build-up, Cobb 1983), received at 2·f0;
 * - `scatterer-harmonic`: a harmonic made at the scatterer (contrast agents): out at f0, back at 2·f0.
 */
export type ReceiveMode = 'fundamental' | 'tissue-harmonic' | 'scatterer-harmonic';

/** Acoustic properties of one medium. */
export interface Tissue {
	/** Library id (`fat`, `liver` …); absent for a custom tissue. */
	readonly id?: string;
	readonly label: string;
	/** Speed of sound, m/s. */
	readonly speedMps: number;
	/** Density, kg/m³. */
	readonly densityKgM3: number;
	/** One-way attenuation at 1 MHz, dB/cm/MHzⁿ. */
	readonly alphaDbPerCmMhz: number;
	/** Power-law exponent n of α(f) = α0·fⁿ. */
	readonly exponent: number;
	/** Where the values come from (author, year, table), for traceability. */
	readonly source?: string;
	readonly spread?: TissueSpread;
	/** Acoustic nonlinearity parameter B/A (drives the tissue harmonic); absent = soft-tissue default. */
	readonly nonlinearityBA?: number;
	/** Where the B/A comes from. */
	readonly nonlinearitySource?: string;
}

/** One layer of the stack, from the skin down. */
export interface Layer {
	readonly tissue: Tissue;
	/** True (physical) thickness along the beam, cm. The last layer extends as far as needed. */
	readonly thicknessCm: number;
}

export type KnotPlacement = 'band-centres' | 'band-edges';
export type EndBehaviour = 'flat' | 'extrapolate';

/** How the scanner turns N slider values into a curve over displayed depth. */
export interface SliderBank {
	/** Number of depth sliders. */
	readonly count: number;
	/** Lowest and highest value of one slider, dB. */
	readonly minDb: number;
	readonly maxDb: number;
	/**
	 * Where the slider values sit on the displayed depth axis:
	 * - `band-centres`: slider k at (k + ½)·D/N (each slider owns an equal band of the display);
	 * - `band-edges`: slider k at k·D/(N − 1), the first at the skin and the last at the display depth.
	 */
	readonly knots: KnotPlacement;
	/** With band centres: `flat` holds the end sliders' values out to the skin and the display
	 * bottom; `extrapolate` continues the end segments' slopes. */
	readonly ends: EndBehaviour;
	/**
	 * One-way slope (dB/cm/MHz) of the depth ramp the scanner applies on its own, with every slider
	 * at its centre: the sliders are offsets from it. 0 makes the sliders absolute. The ramp is
	 * 2·slope·f·d dB at displayed depth d (f: the centre frequency of each leg).
	 */
	readonly rampDbPerCmMhz: number;
}

/**
 * A scanner's own depth gain measured from phantom images (a scanner profile): replaces the
 * assumed built-in ramp. Valid for the probe, preset, depth and focus it was measured with.
 */
export interface ScannerResponse {
	readonly id: string;
	readonly label: string;
	/** Displayed depths (ascending) and the scanner's gain there with sliders centred, dB re its shallowest point. */
	readonly depthsCm: readonly number[];
	readonly gainDb: readonly number[];
	/** dB that full travel of one slider adds at its knot; null when not measured. */
	readonly sliderTravelDb: number | null;
	/** Settings it was measured at, to say when a plan differs. */
	readonly centerMhz: number;
	readonly displayDepthCm: number;
	readonly sliderCount: number;
}

/** The whole setup for one patient and exam, already resolved (tissues are full records). */
export interface EnginePlan {
	readonly name: string;
	readonly region: string;
	readonly layers: readonly Layer[];
	readonly probe: {
		/** Transmit centre frequency, MHz. */
		readonly centerMhz: number;
		/** −6 dB full width of the pulse-echo amplitude spectrum / centre frequency; 0 = narrowband. */
		readonly bandwidthFraction: number;
		/**
		 * Steepness p of the pulse-echo amplitude spectrum |H(f)| = 10^(−(6/20)·|2(f − f0)/(B·f0)|^p):
		 * −6 dB at the same half-width for every p; 2 (the default) is the Gaussian, real probes sit
		 * around 3–7 (steeper skirts, no low-frequency tail).
		 */
		readonly spectrumSteepness?: number;
		/** What the probe receives; absent = fundamental. */
		readonly receive?: ReceiveMode;
		/** Beam angle from the layer normal in the first layer, degrees (layers parallel); absent = 0. */
		readonly angleDeg?: number;
	};
	/** Echo power of the reference scatterer ∝ f^m (0: frequency independent; 4: Rayleigh). */
	readonly scattererExponent: number;
	readonly display: {
		readonly depthCm: number;
		/** Speed the scanner assumes to turn echo time into depth, m/s. */
		readonly assumedSpeedMps: number;
	};
	readonly sliders: SliderBank;
	readonly masterGain: {
		readonly minDb: number;
		readonly maxDb: number;
		/**
		 * Master gain that shows the reference tissue right under the skin at the intended brightness
		 * with every slider centred. Compensation is relative to the skin, so the fitted master gain is
		 * this plus the part of the compensation the sliders do not carry.
		 */
		readonly baseDb: number;
	};
	/** Largest round-trip loss (dB) the system can still lift above its noise floor. */
	readonly noiseBudgetDb: number;
	/** Receive mode the noise budget was measured or stated for; absent = fundamental. A budget
	 * for another mode than the probe's is used as it stands, with a warning. */
	readonly noiseBudgetReceive?: ReceiveMode;
	/** Measured depth response that replaces the built-in ramp; absent = the ramp as assumed. */
	readonly scanner?: ScannerResponse;
}

/** Why a depth gives no useful echo. */
export type WarningCode =
	| 'strong-reflector'
	| 'strong-absorber'
	| 'below-noise-floor'
	| 'slider-range-exceeded'
	| 'speed-mismatch'
	| 'harmonic-simplified'
	| 'budget-receive-mismatch'
	| 'refraction-shift'
	| 'thick-body-wall'
	| 'scanner-profile';

export interface CurveWarning {
	readonly code: WarningCode;
	/** `warning`: the operator must act or know the curve stops; `note`: background (depth drawn off by speed). */
	readonly severity: 'warning' | 'note';
	readonly message: string;
	/** Displayed depth the warning applies from, cm (absent when it concerns the whole plan). */
	readonly depthCm?: number;
}

/** One point of the compensation curve. */
export interface CurveSample {
	readonly displayedDepthCm: number;
	readonly trueDepthCm: number;
	/** Index of the layer this depth falls in. */
	readonly layerIndex: number;
	/** Round-trip attenuation of the reference scatterer's echo, dB. */
	readonly attenuationDb: number;
	/** Round-trip transmission loss of all interfaces crossed, dB. */
	readonly interfaceLossDb: number;
	/** Gain that brings the echo back to its level at the skin, dB (held flat once blocked). */
	readonly compensationDb: number;
	/** Compensation with every tissue at the low / high end of its attenuation spread. */
	readonly lowDb: number;
	readonly highDb: number;
	/** Power-weighted mean frequency of the returning echo, MHz. */
	readonly echoCenterMhz: number;
	/** Below a strong reflector or absorber: not compensated. */
	readonly blocked: boolean;
	/** Loss exceeds the noise budget: gain would lift only noise. */
	readonly belowNoise: boolean;
}

export interface SliderSetting {
	/** Displayed depth of the slider's knot, cm. */
	readonly depthCm: number;
	/** Slider value, dB (within the slider range). */
	readonly gainDb: number;
}

/** Sliders plus master gain fitted to a target curve. */
export interface SliderFit {
	/** Slider values: offsets from the built-in ramp (absolute when the ramp is 0). */
	readonly sliders: readonly SliderSetting[];
	readonly masterGainDb: number;
	/** Worst |fitted − target| over the usable depth range, dB. */
	readonly residualDb: number;
	/** Displayed depth where that worst error occurs, cm. */
	readonly residualAtCm: number;
}

export interface CurveResult {
	readonly plan: EnginePlan;
	readonly samples: readonly CurveSample[];
	readonly fit: SliderFit;
	/** Displayed depth where the loss first exceeds the noise budget; null if it never does on screen. */
	readonly penetrationDepthCm: number | null;
	/** Displayed depth below which no useful echo returns (reflector/absorber); null if none. */
	readonly blockedDepthCm: number | null;
	/** Deepest displayed depth the fit was asked to match, cm. */
	readonly usableDepthCm: number;
	readonly warnings: readonly CurveWarning[];
}
