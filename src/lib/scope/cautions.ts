/**
 * Safety and legal cautions raised by a job's answers. They guide, they do not rule: the list is
 * shown under one sentence deferring to local road rules and licensed practice
 * (DEFER_TO_LOCAL_RULES), said once for all of them.
 */
import type { JobRequestInput } from './request';

export type CautionSeverity = 'danger' | 'warning' | 'info';

export type CautionCode =
	| 'curtain-airbags'
	| 'hybrid-ev-12v'
	| 'start-stop-battery'
	| 'lithium-12v'
	| 'windscreen-position'
	| 'fuse-tap-orientation'
	| 'safety-circuits'
	| 'ground-point'
	| 'obd-always-on'
	| 'socket-live-when-off'
	| 'rear-window'
	| 'drilling-consent'
	| 'consumer-guarantees';

export interface Caution {
	code: CautionCode;
	severity: CautionSeverity;
	title: string;
	body: string;
}

/** Said once above the list: this guide never overrides the law or a licensed professional. */
export const DEFER_TO_LOCAL_RULES =
	'Where local road rules, vehicle standards or licensed practice say otherwise, follow them.';

// Most serious first, so the sheet leads with what can hurt someone.
const SEVERITY_ORDER: Readonly<Record<CautionSeverity, number>> = {
	danger: 0,
	warning: 1,
	info: 2
};

export type CautionInput = Pick<
	JobRequestInput,
	'curtainAirbags' | 'hybridOrEv' | 'startStop' | 'batteryType' | 'cameras' | 'power'
>;

/**
 * The cautions that apply to a job, most serious first.
 * @param input the answers that trigger cautions
 */
export function cautionsFor(input: CautionInput): Caution[] {
	const cautions: Caution[] = [];
	const add = (code: CautionCode, severity: CautionSeverity, title: string, body: string) =>
		cautions.push({ code, severity, title, body });
	const hasFuseTaps = input.power === 'hardwired-switched' || input.power === 'hardwired-parking';
	const hasRear = input.cameras !== 'front';

	if (input.curtainAirbags !== 'no') {
		add(
			'curtain-airbags',
			'danger',
			'Route cables behind the curtain airbags',
			`${input.curtainAirbags === 'unknown' ? 'Treat the car as having curtain airbags until checked. ' : ''}` +
				'Curtain airbags fill along the roof edge between the pillars. Cables go behind the ' +
				'airbag, tied to the factory harness, never across its face or where trim swings open ' +
				"when it fires. The vehicle's service manual shows where it sits."
		);
	} else {
		// Owners often cannot tell, and a wrong 'no' is the dangerous mistake: keep a caution.
		add(
			'curtain-airbags',
			'warning',
			'Confirm on the day: curtain airbags',
			'You said the car has no curtain airbags. Owners often cannot tell, so the installer ' +
				"checks on the day (an 'SRS' or 'airbag' mark on the pillar or roof-edge trim, or the " +
				'service manual) and routes the cable behind the pillar trim along the factory loom ' +
				'either way, never across the face of an airbag or where trim swings open.'
		);
	}
	if (input.hybridOrEv) {
		add(
			'hybrid-ev-12v',
			'danger',
			'Hybrid or electric vehicle: 12 V side only',
			'Work only on the 12 V accessory circuits; orange high-voltage cabling and its connectors ' +
				'are left alone. The 12 V battery in these cars is often small and only charged while the ' +
				'car is switched on, so parking mode can flatten it quickly.'
		);
	}
	if (hasFuseTaps) {
		add(
			'safety-circuits',
			'danger',
			'Never tap a safety circuit',
			'Leave airbag (SRS), ABS and stability control, engine management, fuel pump and steering ' +
				'fuses alone. Choose an accessory circuit such as the socket, radio or interior lights.'
		);
	}
	if (input.startStop || input.batteryType === 'agm' || input.batteryType === 'efb') {
		add(
			'start-stop-battery',
			'warning',
			'Start-stop, AGM or EFB battery',
			'These batteries already work at partial charge, so set a higher cut-off voltage. Cars ' +
				'with a current sensor on the negative battery terminal must not have accessories ' +
				'grounded to the negative post, or the charging system loses track of the battery.'
		);
	}
	if (input.batteryType === 'lithium') {
		add(
			'lithium-12v',
			'warning',
			'12 V lithium battery',
			'Lead-acid voltage tables and cut-off settings do not apply: a lithium battery holds ' +
				'nearly the same voltage until it is almost empty, so a lead-acid cut-off can let parking ' +
				"mode run it down to its own protection. Use a cut-off made for lithium (ask the kit's " +
				'maker or the vehicle maker) or a separate battery pack; the sheet gives no parking estimate.'
		);
	}
	add(
		'windscreen-position',
		'warning',
		'Where the front camera goes on the windscreen',
		"Mount it inside the area the wipers sweep and outside the driver's line of sight, clear of " +
			'the mirror as it adjusts and of any rain sensor or driver-assist camera. In Australia see ' +
			"the Australian Road Rules as each state adopts them, r 297 (driver's clear view) and " +
			"r 299 (display units), and the state's vehicle standards on anything obscuring the view."
	);
	if (hasFuseTaps) {
		add(
			'fuse-tap-orientation',
			'warning',
			'Fit the fuse tap on the supply side',
			'Pull the fuse and probe both terminals of the empty slot with a test light or ' +
				"multimeter: the live one is the supply side, and the tap's common blade goes there. " +
				'Fitted the other way, the original fuse carries its own load plus the camera. On a ' +
				"two-slot tap the car's original fuse goes in the slot that feeds the car's circuit and " +
				'the new, small fuse in the added slot, never larger than the original. A switched supply ' +
				'is live with the ignition on and dead once any delayed switch-off has passed; a ' +
				'permanent supply must stay live with the car locked and asleep, which on some cars takes ' +
				'many minutes, so it is tested only after the car has gone to sleep. Where a tap is used ' +
				'in a way that leaves a blade exposed, that blade is insulated or removed.'
		);
		add(
			'ground-point',
			'warning',
			'Ground to bare metal',
			'Use a bare-metal body stud or factory ground bolt near the fuse box, not painted metal, ' +
				'an airbag module mount or a seat-belt anchor bolt.'
		);
	}
	if (input.power === 'obd') {
		add(
			'obd-always-on',
			'warning',
			'OBD power: live with the car off on most cars',
			'On most cars the OBD port stays live with the car off and locked (pin 16 is permanent ' +
				'battery positive, SAE J1962); on some it switches off with the ignition or once the car ' +
				'sleeps, and parking mode then stops, so the installer checks it with a multimeter. The ' +
				'OBD cable needs a low-voltage cut-off set high enough to leave starting reserve; unplug ' +
				'it if the car will sit for weeks. Route the lead clear of the pedals and of any knee ' +
				'airbag under the dash, tied so it cannot drop into the footwell.'
		);
	}
	if (input.power === 'socket' || input.power === 'battery-pack') {
		add(
			'socket-live-when-off',
			'info',
			'Check whether the socket switches off',
			'In many cars the 12 V socket goes dead with the ignition, so the camera records only ' +
				'while driving. In some it stays live with the car off: a camera left plugged in then ' +
				'keeps drawing from the battery and can flatten it. Check with the car locked, and ' +
				'unplug the camera when the car will sit for long.'
		);
	}
	if (hasRear) {
		add(
			'rear-window',
			'info',
			'Rear camera placement',
			"Inside the glass: within the rear wiper's sweep where the car has one, so the camera " +
				'looks through cleared glass; clear of the demister and printed antenna lines; high ' +
				"enough not to block the driver's view in the mirror. Leave slack in the cable at the " +
				'tailgate hinge. Where the cable passes through a rubber boot, use a lubricant that is ' +
				'safe for rubber (silicone), never a petroleum-based one, which swells and splits it.'
		);
		add(
			'drilling-consent',
			'info',
			'No drilling without your consent',
			'Most rear cables pass through existing grommets. If a new hole is needed, that is a ' +
				'permanent change to the car and the installer asks first.'
		);
	}
	add(
		'consumer-guarantees',
		'info',
		'Your consumer guarantees',
		'In Australia, guarantees that work is done with due care and skill cannot be excluded ' +
			'by any warranty terms (ACCC guidance for motor vehicle repairs). Ask the vehicle maker or ' +
			"dealer how fitting an accessory bears on the car's own warranty."
	);
	return cautions.sort((a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity]);
}

/**
 * A caution's own advice. Scope sheets posted before the sentence on local rules moved above the
 * list still carry it at the end of each body; it is said once now, so it is left off here.
 * @param body a caution body as stored
 */
export function cautionAdvice(body: string): string {
	return body.endsWith(DEFER_TO_LOCAL_RULES)
		? body.slice(0, -DEFER_TO_LOCAL_RULES.length).trimEnd()
		: body;
}
