import { useDetailsOpen } from '@/lib/client/use-details-open';
import type { Scenario } from '@/engine/browser';

/** Where this browser remembers whether the member keeps the conditions open. */
const OPEN_KEY = 'sagwise.conditions.open';

/** The conditions in one line, as the closed form shows them. */
export function conditionsLine(s: Scenario): string {
	const pct = (x: number) => `${Math.round(x * 100)} %`;
	const volts = [...s.voltagesV].sort((a, b) => a - b);
	return [
		`${s.engineRpm.toLocaleString('en')} rpm`,
		`music ${pct(s.sustainedDemand)}`,
		`burp ${pct(s.burpDemand)}`,
		`cables at ${s.conductorTempC} °C`,
		`drop target ${s.dropTargetV} V`,
		`supply ${volts.join(', ')} V`,
	].join(' · ');
}

/** The conditions the figures are computed for: engine speed, music and burp level, cable temperature, drop target, supply voltages. */
export function ScenarioControls({
	scenario,
	onChange: setScenario,
}: {
	scenario: Scenario;
	onChange: (update: (s: Scenario) => Scenario) => void;
}) {
	const set = <K extends keyof Scenario>(key: K, value: Scenario[K]) =>
		setScenario((s) => ({ ...s, [key]: value }));
	// One line until opened (in place); the choice is remembered in this browser.
	const { ref, open, onToggle } = useDetailsOpen(
		() => {
			try {
				return localStorage.getItem(OPEN_KEY) === '1';
			} catch {
				return null; // storage refused (private mode): closed it is
			}
		},
		(now) => {
			try {
				localStorage.setItem(OPEN_KEY, now ? '1' : '0');
			} catch {
				// not remembered, still works
			}
		},
	);
	return (
		<section aria-labelledby="scenario-heading" id="conditions">
			<details
				ref={ref}
				open={open}
				onToggle={onToggle}
				className="rounded-md border border-hairline bg-card"
			>
				<summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3 gap-y-0.5 px-4 py-2">
					<span id="scenario-heading" className="font-bold">
						Conditions
					</span>
					<span className="min-w-0 flex-1 text-sm text-ink-soft">{conditionsLine(scenario)}</span>
					<span className="text-sm text-copper-dark underline">{open ? 'Close' : 'Change'}</span>
				</summary>
				<div className="grid gap-3 border-t border-hairline p-4 sm:grid-cols-3 lg:grid-cols-7">
					<ScenarioNumber
						label="Engine speed"
						unit="rpm"
						value={scenario.engineRpm}
						onChange={(v) => set('engineRpm', v)}
						min={0}
						max={8000}
						step={100}
					/>
					<ScenarioNumber
						label="Music level"
						unit="% of rated"
						value={scenario.sustainedDemand * 100}
						onChange={(v) => set('sustainedDemand', v / 100)}
						min={1}
						max={100}
						step={1}
					/>
					<ScenarioNumber
						label="Burp level"
						unit="% of rated"
						value={scenario.burpDemand * 100}
						onChange={(v) => set('burpDemand', v / 100)}
						min={1}
						max={150}
						step={5}
					/>
					<ScenarioNumber
						label="Cable temperature"
						unit="°C"
						value={scenario.conductorTempC}
						onChange={(v) => set('conductorTempC', v)}
						min={-20}
						max={120}
						step={5}
					/>
					<ScenarioNumber
						label="Drop target"
						unit="V"
						value={scenario.dropTargetV}
						onChange={(v) => set('dropTargetV', v)}
						min={0.05}
						max={3}
						step={0.05}
					/>
					{/* Two columns wide: the whole list of voltages shows, not its first three. */}
					<div className="flex flex-col gap-1 text-sm sm:col-span-2 lg:col-span-2">
						<label htmlFor="voltages" className="font-semibold">
							Supply voltages (V)
						</label>
						<input
							id="voltages"
							defaultValue={scenario.voltagesV.join(', ')}
							onBlur={(e) => {
								const vs = e.target.value
									.split(/[,\s]+/)
									.map(Number)
									.filter((x) => Number.isFinite(x) && x >= 6 && x <= 20);
								if (vs.length) set('voltagesV', vs);
							}}
							className="num rounded-md border border-hairline px-2 py-1"
						/>
					</div>
				</div>
			</details>
		</section>
	);
}

export function ScenarioNumber({
	label,
	unit,
	value,
	onChange,
	min,
	max,
	step,
}: {
	label: string;
	unit: string;
	value: number;
	onChange: (v: number) => void;
	min: number;
	max: number;
	step: number;
}) {
	const id = label.replace(/\W+/g, '-').toLowerCase();
	return (
		<div className="flex flex-col gap-1 text-sm">
			<label htmlFor={id} className="font-semibold">
				{label} <span className="font-normal text-ink-soft">({unit})</span>
			</label>
			<input
				id={id}
				type="number"
				className="num rounded-md border border-hairline px-2 py-1 text-right"
				value={Number(value.toFixed(3))}
				min={min}
				max={max}
				step={step}
				onChange={(e) =>
					Number.isFinite(e.target.valueAsNumber) &&
					e.target.valueAsNumber >= min &&
					e.target.valueAsNumber <= max &&
					onChange(e.target.valueAsNumber)
				}
			/>
		</div>
	);
}
