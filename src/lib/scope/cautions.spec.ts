import { describe, expect, it } from 'vitest';
import { DEFER_TO_LOCAL_RULES, cautionAdvice, cautionsFor, type CautionInput } from './cautions';

const quiet: CautionInput = {
	curtainAirbags: 'no',
	hybridOrEv: false,
	startStop: false,
	batteryType: 'flooded',
	cameras: 'front',
	power: 'socket'
};

function codes(input: Partial<CautionInput>): string[] {
	return cautionsFor({ ...quiet, ...input }).map((c) => c.code);
}

describe('cautionsFor', () => {
	it('always covers windscreen position and consumer guarantees', () => {
		// Source: Australian Road Rules r 297 (driver's clear view); ACCC motor vehicle repairs
		// guide (consumer guarantees cannot be excluded).
		expect(codes({})).toEqual(['windscreen-position', 'consumer-guarantees']);
		const windscreen = cautionsFor(quiet).find((c) => c.code === 'windscreen-position');
		expect(windscreen?.body).toContain('r 297');
	});

	it('raises curtain airbags for yes and unknown, not for no', () => {
		// Source: vehicle service manuals — route cables behind curtain airbags.
		expect(codes({ curtainAirbags: 'yes' })).toContain('curtain-airbags');
		expect(codes({ curtainAirbags: 'unknown' })).toContain('curtain-airbags');
		expect(codes({ curtainAirbags: 'no' })).not.toContain('curtain-airbags');
		const unknown = cautionsFor({ ...quiet, curtainAirbags: 'unknown' })[0];
		expect(unknown?.severity).toBe('danger');
		expect(unknown?.body).toMatch(/^Treat the car as having curtain airbags/);
	});

	it('raises hybrid/EV and battery cautions only when they apply', () => {
		// Source: common trade practice — hybrid/EV 12 V systems; AGM/EFB/start-stop batteries.
		expect(codes({ hybridOrEv: true })).toContain('hybrid-ev-12v');
		expect(codes({ startStop: true })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'agm' })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'efb' })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'unknown' })).not.toContain('start-stop-battery');
	});

	it('raises fuse-tap cautions only for hard-wired power', () => {
		// Source: tap makers' instructions and common trade practice (supply side, no safety
		// circuits, bare-metal ground).
		for (const power of ['hardwired-switched', 'hardwired-parking'] as const) {
			expect(codes({ power })).toEqual(
				expect.arrayContaining(['fuse-tap-orientation', 'safety-circuits', 'ground-point'])
			);
		}
		for (const power of ['socket', 'obd', 'battery-pack'] as const) {
			expect(codes({ power })).not.toContain('fuse-tap-orientation');
			expect(codes({ power })).not.toContain('safety-circuits');
		}
	});

	it('raises the OBD cut-off caution only for OBD power', () => {
		// Source: SAE J1962 — pin 16 is permanent battery positive.
		expect(codes({ power: 'obd' })).toContain('obd-always-on');
		expect(codes({ power: 'hardwired-parking' })).not.toContain('obd-always-on');
	});

	it('raises drilling consent and rear-window notes with a rear camera', () => {
		// Source: common trade practice — drilling is a permanent change needing consent;
		// keep clear of demister elements.
		expect(codes({ cameras: 'front-rear' })).toEqual(
			expect.arrayContaining(['drilling-consent', 'rear-window'])
		);
		expect(codes({ cameras: 'front' })).not.toContain('drilling-consent');
	});

	it('orders by severity and defers to local rules in every body', () => {
		// Source: product rule — cautions guide, local rules and licensed practice decide.
		const all = cautionsFor({
			curtainAirbags: 'yes',
			hybridOrEv: true,
			startStop: true,
			batteryType: 'agm',
			cameras: 'front-rear-cabin',
			power: 'hardwired-parking'
		});
		const rank = { danger: 0, warning: 1, info: 2 };
		const ranks = all.map((c) => rank[c.severity]);
		expect(ranks).toEqual([...ranks].sort((a, b) => a - b));
		expect(all[0]?.severity).toBe('danger');
		for (const caution of all) {
			// The sentence on local rules is said once above the list, not in every caution.
			expect(caution.body).not.toContain(DEFER_TO_LOCAL_RULES);
			expect(caution.title.length).toBeGreaterThan(0);
		}
	});
});

describe('cautionAdvice', () => {
	it('leaves the sentence on local rules off bodies stored with it, and others as they are', () => {
		// Source: the form contract (the sentence is shown once above the list).
		expect(cautionAdvice(`Keep the cable clear. ${DEFER_TO_LOCAL_RULES}`)).toBe(
			'Keep the cable clear.'
		);
		expect(cautionAdvice('Keep the cable clear.')).toBe('Keep the cable clear.');
	});
});
