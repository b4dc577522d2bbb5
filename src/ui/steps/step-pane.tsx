/** The current step's own view (steps 1 to 4; step 5 has its own layout). */
import type {SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import type {ConsoleState} from '../state/console-state.js';
import {ProbeStep} from './probe-step.js';
import {StackStep} from './stack-step.js';
import {StartStep} from './start-step.js';
import {UsualStep} from './usual-step.js';

export interface StepPaneProps {
	readonly state: ConsoleState;
	readonly curve: CurveResult;
	readonly delta: SettingsDelta | null;
	readonly width: number;
	readonly height: number;
	readonly isFocused: boolean;
}

export function StepPane({state, curve, delta, width, height, isFocused}: StepPaneProps) {
	const props = {state, width, height, isFocused};
	switch (state.step) {
		case 'start':
			return <StartStep {...props} />;
		case 'stack':
			return <StackStep {...props} />;
		case 'probe':
			return <ProbeStep {...props} />;
		default:
			return <UsualStep {...props} curve={curve} delta={delta} />;
	}
}
