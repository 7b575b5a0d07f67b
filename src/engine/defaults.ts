import type { Alternator, Amplifier, BatteryBank } from './types';

/**
 * A part from the fields that identify it, with every other field at the usual value: one place
 * for the editor's new parts, the demo builds and the test networks. The values are ordinary
 * starting points (20 h capacity rating, 105 °C-class defaults elsewhere), not measurements.
 */
export function bankWithDefaults(
	b: Partial<BatteryBank> &
		Pick<
			BatteryBank,
			| 'id'
			| 'label'
			| 'positive'
			| 'negative'
			| 'chemistry'
			| 'unitCapacityAh'
			| 'unitResistanceOhm'
		>,
): BatteryBank {
	return {
		// A 12 V-class unit: six lead-acid cells or four LiFePO4 cells.
		cellsPerUnit: b.chemistry === 'lfp' ? 4 : 6,
		unitsInSeries: 1,
		stringsInParallel: 1,
		ratedHours: 20,
		stateOfCharge: 0.9,
		peukertK: null,
		absorptionV: null,
		floatV: null,
		maxChargeC: null,
		location: 'trunk',
		secured: true,
		vented: false,
		...b,
	};
}

export function alternatorWithDefaults(
	a: Partial<Alternator> &
		Pick<Alternator, 'id' | 'label' | 'positive' | 'negative' | 'ratedHotA' | 'setPointV'>,
): Alternator {
	return {
		curve: [],
		curveIsCold: false,
		hotFactor: 0.8,
		pulleyRatio: 2.6,
		sourceResistanceOhm: 1e-4,
		...a,
	};
}

export function amplifierWithDefaults(
	a: Partial<Amplifier> & Pick<Amplifier, 'id' | 'label' | 'positive' | 'negative' | 'ratedPowerW'>,
): Amplifier {
	return { ratedVoltageV: 14.4, efficiency: 0.8, quantity: 1, regulated: false, ...a };
}
