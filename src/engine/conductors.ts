import type { AwgSize, Cable, CableSize, Material } from './types';

/** 1 circular mil in mm²: (π/4)·(0.0254 mm)², exact by the definition of the inch. */
export const MM2_PER_CMIL = (Math.PI / 4) * 0.0254 ** 2;

/** AWG designation → gauge number n (1/0 → 0, 2/0 → −1, 3/0 → −2, 4/0 → −3). */
export function awgNumber(awg: AwgSize): number {
	const zeros = /^(\d)\/0$/.exec(awg);
	return zeros ? 1 - Number(zeros[1]) : Number(awg);
}

/**
 * Diameter of a solid AWG wire in inches: d = 0.005 · 92^((36 − n)/39) (ASTM B258 definition).
 * With `rounded`, the diameter is rounded as B258 tabulates it: to 0.0001 in.
 */
export function awgDiameterIn(awg: AwgSize, { rounded = true } = {}): number {
	const d = 0.005 * 92 ** ((36 - awgNumber(awg)) / 39);
	return rounded ? Math.round(d * 1e4) / 1e4 : d;
}

/** Area of an AWG size in circular mils: (d in mils)², from the B258-rounded diameter. */
export function awgAreaCmil(awg: AwgSize): number {
	return (awgDiameterIn(awg) * 1000) ** 2;
}

export function awgAreaMm2(awg: AwgSize): number {
	return awgAreaCmil(awg) * MM2_PER_CMIL;
}

export const mm2ToCmil = (mm2: number): number => mm2 / MM2_PER_CMIL;

/** Metal cross-section of one run of a cable (mm²). */
export function cableAreaMm2(size: CableSize): number {
	switch (size.kind) {
		case 'awg':
			return awgAreaMm2(size.awg);
		case 'mm2':
			return size.mm2;
		case 'measured':
			return size.areaMm2;
	}
}

export interface MaterialProps {
	label: string;
	/** Volume resistivity at 20 °C (Ω·mm²/m). */
	resistivity20: number;
	/** Temperature coefficient of resistance at 20 °C (1/K). */
	alpha20: number;
	/** Conductivity as a fraction of annealed copper (IACS). */
	iacs: number;
}

const COPPER_RHO = 1 / 58; // 100 % IACS: 58 MS/m at 20 °C

/**
 * Resistivity and temperature coefficient by material.
 * - copper: 100 % IACS, 1/58 Ω·mm²/m, α 0.00393/K.
 * - tinned copper: ×1.03, the low end of the coated/uncoated ratio of stranded cable in NEC
 *   Chapter 9 Table 8 (1.030–1.045).
 * - CCA 10 % / 15 % copper by volume: 62.9 % / 64.4 % IACS, a wire maker's stated minimum for
 *   ASTM B566 classes; α ≈ 0.0040/K (aluminium-dominated, from memory).
 * - aluminium 1350-H19: 61.0 % IACS minimum, α 0.00403/K.
 */
export const MATERIAL_PROPS: Record<Material, MaterialProps> = {
	copper: { label: 'Copper (OFC)', resistivity20: COPPER_RHO, alpha20: 0.00393, iacs: 1 },
	tinned_copper: {
		label: 'Tinned copper',
		resistivity20: COPPER_RHO * 1.03,
		alpha20: 0.00393,
		iacs: 1 / 1.03,
	},
	cca10: { label: 'CCA (10 % Cu)', resistivity20: COPPER_RHO / 0.629, alpha20: 0.004, iacs: 0.629 },
	cca15: { label: 'CCA (15 % Cu)', resistivity20: COPPER_RHO / 0.644, alpha20: 0.004, iacs: 0.644 },
	aluminium: { label: 'Aluminium', resistivity20: COPPER_RHO / 0.61, alpha20: 0.00403, iacs: 0.61 },
};

/** Resistivity at temperature T: ρ(T) = ρ₂₀·[1 + α₂₀·(T − 20)] (Ω·mm²/m). */
export function resistivityAt(material: Material, tempC: number): number {
	const m = MATERIAL_PROPS[material];
	return m.resistivity20 * (1 + m.alpha20 * (tempC - 20));
}

/**
 * Lay (stranding) increment of resistance: the strands of a stranded conductor run helically, so
 * each is longer than the cable. ASTM B8 (concentric-lay-stranded copper conductors) takes the
 * increment of resistance and mass as 2 % for sizes up to 2000 kcmil (value from memory); NEC
 * Chapter 9 Table 8's stranded copper figures sit 1.8–2.2 % above the solid formula for 8 AWG–4/0,
 * which agrees. Every vehicle power cable is stranded, so every cable carries it.
 */
export const STRANDING_FACTOR = 1.02;

/** Resistance per metre of a solid conductor of the same cross-section: ρ(T)/A (Ω/m). */
export function solidResistancePerMetre(size: CableSize, material: Material, tempC = 20): number {
	return resistivityAt(material, tempC) / cableAreaMm2(size);
}

/** Resistance per metre of one stranded run (Ω/m): ρ(T)·k_lay/A at the given conductor temperature. */
export function resistancePerMetre(size: CableSize, material: Material, tempC = 20): number {
	return solidResistancePerMetre(size, material, tempC) * STRANDING_FACTOR;
}

/**
 * Resistance of a whole cable (Ω): ρ(T)·k_lay·L / (A·runs), runs in parallel, plus the resistance
 * of its terminations when one is stated, plus each fuse holder's or breaker's contacts, in series
 * with the whole cable (resistances in series add).
 */
export function cableResistanceOhm(
	cable: Pick<Cable, 'size' | 'material' | 'lengthM' | 'parallelRuns' | 'connectionResistanceOhm'> &
		Partial<Pick<Cable, 'fuses'>>,
	tempC = 20,
): number {
	return (
		(resistancePerMetre(cable.size, cable.material, tempC) * cable.lengthM) / cable.parallelRuns +
		(cable.connectionResistanceOhm ?? 0) +
		protectionResistanceOhm(cable)
	);
}

/** The contacts of a cable's fuse holders and breakers together (Ω). */
export function protectionResistanceOhm(cable: Partial<Pick<Cable, 'fuses'>>): number {
	return (cable.fuses ?? []).reduce((sum, f) => sum + (f.contactResistanceOhm ?? 0), 0);
}

/**
 * Circular mils per ampere the trade asks for: 300 cmil/A for copper (common practice, no
 * published source), scaled by the material's resistivity relative to copper.
 */
export function requiredCmilPerAmp(material: Material): number {
	return 300 * (MATERIAL_PROPS[material].resistivity20 / COPPER_RHO);
}

/** Circular mils per ampere a cable offers at a current (all runs together). */
export function cmilPerAmp(size: CableSize, parallelRuns: number, currentA: number): number {
	if (currentA <= 0) return Number.POSITIVE_INFINITY;
	return (mm2ToCmil(cableAreaMm2(size)) * parallelRuns) / currentA;
}

/**
 * Allowable amperage of single copper conductors by insulation rating, 30 °C ambient:
 * 33 CFR 183.425 Table 5 (8 AWG to 4/0).
 */
export const AMPACITY_TABLE_TEMPS_C = [60, 75, 80, 90, 105, 125, 200] as const;
export const AMPACITY_TABLE: Record<
	'8' | '6' | '4' | '2' | '1' | '1/0' | '2/0' | '3/0' | '4/0',
	readonly number[]
> = {
	'8': [55, 65, 70, 70, 80, 90, 100],
	'6': [80, 95, 100, 100, 120, 125, 135],
	'4': [105, 125, 130, 135, 160, 170, 180],
	'2': [140, 170, 175, 180, 210, 225, 240],
	'1': [165, 195, 210, 210, 245, 265, 280],
	'1/0': [195, 230, 245, 245, 285, 305, 325],
	'2/0': [225, 265, 285, 285, 330, 355, 370],
	'3/0': [260, 310, 330, 330, 385, 410, 430],
	'4/0': [300, 360, 385, 385, 445, 475, 510],
};

export interface AmpacityEstimate {
	currentA: number;
	/** 'table' when the size and rating are a Table 5 entry; 'interpolated' by area otherwise. */
	basis: 'table' | 'interpolated' | 'extrapolated';
	/** The table column used (°C): the highest rating not above the cable's. */
	columnC: number;
}

/**
 * Current a cable may carry continuously (all runs), from 33 CFR 183.425 Table 5 by insulation
 * rating (the highest column not above it). Sizes between table entries are interpolated on
 * log(area)–log(current); sizes outside are extrapolated the same way. Other materials are
 * scaled by √(ρ_Cu/ρ) so that they dissipate the same I²R per metre (an assumption of ours).
 * Parallel runs add (no bundling derate applied). Returns null below the 60 °C column.
 */
export function ampacityEstimate(
	cable: Pick<Cable, 'size' | 'material' | 'parallelRuns' | 'insulationC'>,
): AmpacityEstimate | null {
	const col = [...AMPACITY_TABLE_TEMPS_C].reverse().findIndex((t) => t <= cable.insulationC);
	if (col < 0) return null;
	const colIndex = AMPACITY_TABLE_TEMPS_C.length - 1 - col;
	const columnC = AMPACITY_TABLE_TEMPS_C[colIndex]!;
	const points = (Object.keys(AMPACITY_TABLE) as (keyof typeof AMPACITY_TABLE)[]).map((awg) => ({
		area: awgAreaMm2(awg),
		amps: AMPACITY_TABLE[awg][colIndex]!,
		awg,
	}));
	const area = cableAreaMm2(cable.size);
	let copperA: number;
	let basis: AmpacityEstimate['basis'];
	const exact =
		cable.size.kind === 'awg'
			? points.find((p) => p.awg === (cable.size as { awg: string }).awg)
			: undefined;
	if (exact) {
		copperA = exact.amps;
		basis = 'table';
	} else {
		let i = points.findIndex((p) => p.area >= area);
		basis = i <= 0 || area > points[points.length - 1]!.area ? 'extrapolated' : 'interpolated';
		if (i <= 0) i = 1;
		if (area > points[points.length - 1]!.area) i = points.length - 1;
		const a = points[i - 1]!;
		const b = points[i]!;
		const slope = Math.log(b.amps / a.amps) / Math.log(b.area / a.area);
		copperA = a.amps * (area / a.area) ** slope;
	}
	const scale = Math.sqrt(1 / (MATERIAL_PROPS[cable.material].resistivity20 / COPPER_RHO));
	return { currentA: copperA * scale * cable.parallelRuns, basis, columnC };
}
