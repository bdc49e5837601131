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
	it('always covers airbags, windscreen position and consumer guarantees', () => {
		// Source: Australian Road Rules r 297 (driver's clear view); ACCC motor vehicle repairs
		// guide (consumer guarantees cannot be excluded); vehicle service manuals (curtain airbags).
		expect(codes({ power: 'hardwired-switched' })).toEqual(
			expect.arrayContaining(['curtain-airbags', 'windscreen-position', 'consumer-guarantees'])
		);
		const windscreen = cautionsFor(quiet).find((c) => c.code === 'windscreen-position');
		expect(windscreen?.body).toContain('r 297');
	});

	it('raises curtain airbags as danger for yes and unknown, and still asks to confirm for no', () => {
		// Source: vehicle service manuals — route cables behind curtain airbags; common trade
		// practice — owners often do not know, so the installer confirms on the day.
		expect(codes({ curtainAirbags: 'yes' })).toContain('curtain-airbags');
		expect(codes({ curtainAirbags: 'unknown' })).toContain('curtain-airbags');
		const unknown = cautionsFor({ ...quiet, curtainAirbags: 'unknown' })[0];
		expect(unknown?.severity).toBe('danger');
		expect(unknown?.body).toMatch(/^Treat the car as having curtain airbags/);
		const no = cautionsFor({ ...quiet, curtainAirbags: 'no' }).find(
			(c) => c.code === 'curtain-airbags'
		);
		expect(no?.severity).toBe('warning');
		expect(no?.title).toBe('Confirm on the day: curtain airbags');
		expect(no?.body).toContain('installer checks on the day');
		expect(no?.body).toContain('behind the pillar trim along the factory loom');
	});

	it('raises hybrid/EV and battery cautions only when they apply', () => {
		// Source: common trade practice — hybrid/EV 12 V systems; AGM/EFB/start-stop batteries.
		expect(codes({ hybridOrEv: true })).toContain('hybrid-ev-12v');
		expect(codes({ startStop: true })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'agm' })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'efb' })).toContain('start-stop-battery');
		expect(codes({ batteryType: 'unknown' })).not.toContain('start-stop-battery');
		// Source: common trade practice — lead-acid tables and cut-offs do not apply to lithium.
		expect(codes({ batteryType: 'lithium' })).toContain('lithium-12v');
		expect(codes({ batteryType: 'flooded' })).not.toContain('lithium-12v');
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

	it('says how to orient a tap, which slot takes which fuse and what to do with a spare blade', () => {
		// Source: tap makers' instructions and common trade practice.
		const body =
			cautionsFor({ ...quiet, power: 'hardwired-parking' }).find(
				(c) => c.code === 'fuse-tap-orientation'
			)?.body ?? '';
		expect(body).toContain('test light or multimeter');
		expect(body).toContain('live with the ignition on and dead once any delayed switch-off');
		expect(body).toContain('locked and asleep');
		expect(body).toContain(
			"original fuse goes in the slot that feeds the car's circuit and the new, small fuse in the added slot"
		);
		expect(body).toContain('insulated or removed');
	});

	it('raises the OBD caution only for OBD power, with pedals, knee airbag and when it stays live', () => {
		// Source: SAE J1962 — pin 16 is permanent battery positive; common trade practice — route
		// clear of the pedals and any knee airbag; some OBD ports stay live with the car off.
		expect(codes({ power: 'obd' })).toContain('obd-always-on');
		expect(codes({ power: 'hardwired-parking' })).not.toContain('obd-always-on');
		const obd = cautionsFor({ ...quiet, power: 'obd' }).find((c) => c.code === 'obd-always-on');
		expect(obd?.body).toContain('clear of the pedals and of any knee airbag');
		expect(obd?.body).toContain('stays live with the car off and locked');
	});

	it('says a socket may stay live with the car off', () => {
		// Source: common trade practice — some sockets stay live with the ignition off.
		expect(codes({ power: 'socket' })).toContain('socket-live-when-off');
		expect(codes({ power: 'battery-pack' })).toContain('socket-live-when-off');
		expect(codes({ power: 'hardwired-switched' })).not.toContain('socket-live-when-off');
		const socket = cautionsFor(quiet).find((c) => c.code === 'socket-live-when-off');
		expect(socket?.body).toContain('stays live with the car off');
	});

	it('raises drilling consent and rear-window notes with a rear camera', () => {
		// Source: common trade practice — drilling is a permanent change needing consent;
		// keep clear of demister elements.
		expect(codes({ cameras: 'front-rear' })).toEqual(
			expect.arrayContaining(['drilling-consent', 'rear-window'])
		);
		expect(codes({ cameras: 'front' })).not.toContain('drilling-consent');
		const rear =
			cautionsFor({ ...quiet, cameras: 'front-rear' }).find((c) => c.code === 'rear-window')
				?.body ?? '';
		// Source: common trade practice — a camera inside the glass sits within the wiper's sweep.
		expect(rear).toContain("within the rear wiper's sweep");
		expect(rear).not.toMatch(/clear of the wiper/i);
		expect(rear).toContain('printed antenna lines');
		expect(rear).toContain('slack in the cable at the tailgate hinge');
		expect(rear).toContain('safe for rubber (silicone), never a petroleum-based one');
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
