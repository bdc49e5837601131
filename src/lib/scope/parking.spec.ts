import { describe, expect, it } from 'vitest';
import { DEMO_WAGON_JOB } from './demo-job';
import type { JobRequestInput } from './request';
import { parkingScope } from './parking';

const JOB = DEMO_WAGON_JOB;

const texts = (job: JobRequestInput) =>
	Object.fromEntries((parkingScope(job)?.assumptions ?? []).map((a) => [a.code, a.text]));

describe('parkingScope', () => {
	it('takes the draw from the camera setup and lists every assumption', () => {
		// Source: from memory — front + rear records at 0.30–0.50 A, top taken; BCI table for 75 %;
		// published workshop-manual drain tests for the car's 25–50 mA.
		const scope = parkingScope(JOB);
		expect(scope?.drawMilliamps).toBe(500);
		expect(scope?.drawDefaulted).toBe(true);
		const t = texts(JOB);
		expect(Object.keys(t)).toEqual([
			'start-charge',
			'camera-draw',
			'standby-draw',
			'table',
			'cut-off',
			'loaded-voltage'
		]);
		expect(t['start-charge']).toContain('75 % (12.45 V at rest), assumed');
		expect(t['camera-draw']).toContain('500 mA for front and rear cameras');
		expect(t['standby-draw']).toContain('50 mA');
		expect(t.table).toContain('Battery Council International');
		expect(t['loaded-voltage']).toContain('below the resting voltage');
		// Worked by hand: 60 x (75 - 44.444) / 100 = 18.333 Ah over 0.5 + 0.05 A = 33.33 h.
		expect(scope?.budget.estimated && scope.budget.hours).toBeCloseTo(33.33, 2);
	});

	it('uses the rest voltage the owner measured', () => {
		// Source: BCI table — 12.24 V is 50 %.
		const t = texts({ ...JOB, restVolts: 12.24 });
		expect(t['start-charge']).toBe('Starting charge: 50 %, from the 12.24 V you measured at rest.');
	});

	it('names the AGM table with its derived points', () => {
		// Source: powersports owner's manual table (100 %, 50 %), other points derived.
		expect(texts({ ...JOB, batteryType: 'agm' }).table).toContain('derived by Tapline');
	});

	it('gives no estimate and no assumptions for a 12 V lithium battery', () => {
		// Source: common trade practice — lead-acid tables do not apply to lithium.
		const scope = parkingScope({ ...JOB, batteryType: 'lithium' });
		expect(scope?.budget.estimated).toBe(false);
		expect(scope?.assumptions).toEqual([]);
	});

	it('uses the strict cut-off for a hybrid or EV', () => {
		// Source: common trade practice — a hybrid's small 12 V battery keeps more in reserve.
		const scope = parkingScope({ ...JOB, hybridOrEv: true });
		expect(scope?.cutOffVolts).toBe(12.4);
		expect(scope?.budget.warnings.map((w) => w.code)).toContain('hybrid-ev');
	});

	it('is null when the camera is off while parked', () => {
		// Source: common trade practice — switched power stops with the ignition.
		expect(parkingScope({ ...JOB, power: 'hardwired-switched' })).toBeNull();
	});
});
