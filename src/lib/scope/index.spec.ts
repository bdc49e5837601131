import { describe, expect, it } from 'vitest';
import { DEMO_WAGON_JOB } from './demo-job';
import { ADELAIDE_MARKET, computeScope } from './index';

const JOB = DEMO_WAGON_JOB;

describe('computeScope', () => {
	it('assembles labour, parts, parking budget, price and cautions', () => {
		const sheet = computeScope(JOB);
		// Source: common trade practice — front + rear through a tailgate 90–150 min, plus our
		// 20–60 min parking-mode test (cars take up to about an hour to sleep).
		expect([sheet.labour.minMinutes, sheet.labour.maxMinutes]).toEqual([110, 210]);
		// Source: common trade practice — wagon rear run 5–6.5 m, 6 m stock -> 1 m extension.
		expect(sheet.rearCable).toEqual({ minMetres: 5, maxMetres: 6.5, extensionMetres: 1 });
		// Source: common trade practice — two taps of the car's family for parking mode.
		expect(sheet.parts.find((p) => p.code === 'fuse-tap-low-profile-mini')?.quantity).toBe(2);
		// Source: BCI table and common trade practice, worked by hand: 60 Ah flooded from the
		// assumed 75 % to the 12.2 V default cut-off (44.444 %) = 18.333 Ah, over the front + rear
		// default draw 500 mA (from memory, top of 0.30–0.50 A) plus the car's 50 mA -> 33.33 h.
		expect(sheet.parking?.cutOffVolts).toBe(12.2);
		expect(sheet.parking?.cutOffDefaulted).toBe(true);
		expect(sheet.parking?.drawMilliamps).toBe(500);
		const budget = sheet.parking?.budget;
		expect(budget?.estimated && budget.hours).toBeCloseTo(33.33, 2);
		expect(sheet.cautions[0]?.code).toBe('curtain-airbags');
		expect(sheet.price.currency).toBe('AUD');
	});

	it('prices the demo market consistently with its parts and GST', () => {
		const sheet = computeScope(JOB, ADELAIDE_MARKET);
		const partsExGst = sheet.price.parts.reduce((s, p) => s + p.totalCents, 0);
		expect(sheet.price.partsExGst).toBe(partsExGst);
		// Source: ATO — GST is 10 % and is 1/11 of the inclusive price; our half-up rounding.
		const minEx = sheet.price.labourExGst.min + partsExGst;
		expect(sheet.price.totalIncGst.min).toBe(minEx + Math.round(minEx / 10));
		expect(sheet.price.gstIncluded.min).toBe(Math.round(sheet.price.totalIncGst.min / 11));
		// Source: our stated rule — 110 $/h x 110 min = 20166.7 c -> 20167 (demo rate, invented).
		expect(sheet.price.labourExGst.min).toBe(20_167);
	});

	it('uses the stricter default cut-off for start-stop cars and honours an owner choice', () => {
		// Source: common trade practice — higher cut-off for start-stop/AGM/EFB.
		expect(computeScope({ ...JOB, startStop: true }).parking?.cutOffVolts).toBe(12.4);
		const chosen = computeScope({ ...JOB, cutOffVolts: 12.3, parkingDrawMilliamps: 120 });
		expect(chosen.parking).toMatchObject({
			cutOffVolts: 12.3,
			cutOffDefaulted: false,
			drawMilliamps: 120,
			drawDefaulted: false
		});
	});

	it('has no parking budget or rear cable when they do not apply', () => {
		// Source: common trade practice — a socket-powered camera stops with the ignition.
		const sheet = computeScope({ ...JOB, power: 'socket', cameras: 'front' });
		expect(sheet.parking).toBeNull();
		expect(sheet.rearCable).toBeNull();
		// Source: SAE J1962 — OBD power is always on, so parking is budgeted.
		expect(computeScope({ ...JOB, power: 'obd' }).parking).not.toBeNull();
	});

	it('prices an installer-supplied camera at the budget', () => {
		const sheet = computeScope({ ...JOB, cameraSupply: 'installer', cameraBudgetCents: 30_000 });
		// Source: the job contract — the owner's budget is GST-inclusive and added as is.
		expect(sheet.price.cameraIncGst).toBe(30_000);
		const ownerSupplied = computeScope(JOB);
		expect(sheet.price.totalIncGst.min - ownerSupplied.price.totalIncGst.min).toBe(30_000);
	});

	it('calibrates the labour total, and so the price guide, from reported fits', () => {
		const sheet = computeScope(JOB);
		// Worked in calibration.spec.ts: five fits, median 140 → 110–210 becomes 100–200.
		const calibrated = computeScope(JOB, ADELAIDE_MARKET, [120, 400, 130, 150, 140]);
		expect([calibrated.labour.minMinutes, calibrated.labour.maxMinutes]).toEqual([100, 200]);
		expect(calibrated.labour.calibration?.fits).toBe(5);
		// The task lines keep the trade's ranges.
		expect(calibrated.labour.lines).toEqual(sheet.labour.lines);
		// Ten minutes less labour at each end lowers the guide at each end.
		expect(calibrated.price.labourExGst.min).toBeLessThan(sheet.price.labourExGst.min);
		expect(calibrated.price.labourExGst.max).toBeLessThan(sheet.price.labourExGst.max);
		// Thin data: the sheet is the default one, with no calibration said.
		const thin = computeScope(JOB, ADELAIDE_MARKET, [60, 70]);
		expect(thin.labour).toEqual(sheet.labour);
		expect(thin.labour.calibration).toBeUndefined();
	});
});
