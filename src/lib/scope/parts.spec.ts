import { describe, expect, it } from 'vitest';
import { fuseTapCount, listParts, rearCableNeed, type Part, type PartsInput } from './parts';

const base: PartsInput = {
	bodyStyle: 'hatchback',
	fuseFamily: 'mini',
	cameras: 'front-rear',
	cameraSupply: 'owner',
	power: 'hardwired-parking'
};

function find(parts: Part[], code: string): Part | undefined {
	return parts.find((part) => part.code === code);
}

describe('fuse taps', () => {
	it('counts taps by power mode', () => {
		// Source: common trade practice — parking mode needs a switched and a permanent supply.
		expect(fuseTapCount('hardwired-parking')).toBe(2);
		expect(fuseTapCount('hardwired-switched')).toBe(1);
		expect(fuseTapCount('socket')).toBe(0);
		expect(fuseTapCount('obd')).toBe(0);
		expect(fuseTapCount('battery-pack')).toBe(0);
	});

	it("matches the vehicle's fuse family, with a fuse and ground for each hard-wired job", () => {
		// Source: common trade practice — the tap must match the slot's fuse family.
		const parts = listParts(base);
		expect(find(parts, 'fuse-tap-mini')?.quantity).toBe(2);
		// Source: common trade practice (1.25 x 0.5 A -> 2 A floor); ISO 8820-3 colour: 2 A grey.
		expect(find(parts, 'accessory-fuse')).toMatchObject({
			quantity: 2,
			label: '2 A mini blade fuse (grey)'
		});
		expect(find(parts, 'ring-terminal')?.quantity).toBe(1);
		expect(find(parts, 'hardwire-kit-cut-off')?.quantity).toBe(1);
		// Source: tap makers' instructions — original fuse in the slot feeding the car's circuit,
		// new small fuse in the added slot; common trade practice — spare blades insulated.
		const note = find(parts, 'fuse-tap-mini')?.note ?? '';
		expect(note).toContain("Original fuse in the slot that feeds the car's circuit");
		expect(note).toContain('new small fuse in the added slot');
		expect(note).toContain('unused exposed blade is insulated or removed');
	});

	it('uses one tap and a plain kit for switched-only power', () => {
		// Source: common trade practice — one switched supply, no cut-off needed.
		const parts = listParts({
			...base,
			power: 'hardwired-switched',
			fuseFamily: 'low-profile-mini'
		});
		expect(find(parts, 'fuse-tap-low-profile-mini')?.quantity).toBe(1);
		expect(find(parts, 'hardwire-kit')).toBeDefined();
		expect(find(parts, 'hardwire-kit-cut-off')).toBeUndefined();
	});

	it('needs no taps or ground for socket, OBD or battery pack', () => {
		// Source: common trade practice — these take power without a fuse slot.
		for (const power of ['socket', 'obd', 'battery-pack'] as const) {
			const parts = listParts({ ...base, power });
			expect(parts.some((p) => p.code.startsWith('fuse-tap'))).toBe(false);
			expect(find(parts, 'accessory-fuse')).toBeUndefined();
			expect(find(parts, 'ring-terminal')).toBeUndefined();
		}
		// Source: SAE J1962 — OBD pin 16 is always live, so the cable needs a cut-off.
		expect(find(listParts({ ...base, power: 'obd' }), 'obd-cable-cut-off')).toBeDefined();
		expect(find(listParts({ ...base, power: 'battery-pack' }), 'battery-pack')).toBeDefined();
	});

	it('leaves an unknown family to the installer and warns about micro3', () => {
		// Source: common trade practice — micro3 slots need their own tap or another slot.
		const unknown = find(listParts({ ...base, fuseFamily: 'unknown' }), 'fuse-tap-unknown');
		expect(unknown?.note).toContain('confirms the fuse family on the day');
		const micro3 = listParts({ ...base, fuseFamily: 'micro3' });
		expect(find(micro3, 'fuse-tap-micro3')?.note).toContain('Micro3');
		// Source: from memory — micro3 fuses start at 5 A (tan, ISO 8820-3 colour).
		expect(find(micro3, 'accessory-fuse')?.label).toBe('5 A micro3 fuse (tan)');
	});
});

describe('rear cable', () => {
	it('needs a length by body style', () => {
		// Source: common trade practice — hatch or sedan 4–5 m, SUV/wagon 5–6.5 m, seven-seater
		// 6–7 m, long van 8–12 m; 6 m is a common stock length.
		expect(rearCableNeed('sedan')).toEqual({ minMetres: 4, maxMetres: 5, extensionMetres: 0 });
		expect(rearCableNeed('suv')).toEqual({ minMetres: 5, maxMetres: 6.5, extensionMetres: 1 });
		expect(rearCableNeed('people-mover')).toEqual({
			minMetres: 6,
			maxMetres: 7,
			extensionMetres: 1
		});
		expect(rearCableNeed('van')).toEqual({ minMetres: 8, maxMetres: 12, extensionMetres: 6 });
	});

	it('adds an extension only with a rear camera and a long run', () => {
		// Source: common trade practice — 12 m van run minus 6 m stock cable = 6 m extension.
		expect(find(listParts({ ...base, bodyStyle: 'van' }), 'rear-cable-extension')?.label).toBe(
			'Rear cable extension, 6 m'
		);
		expect(
			find(listParts({ ...base, bodyStyle: 'van', cameras: 'front' }), 'rear-cable-extension')
		).toBeUndefined();
		expect(
			find(listParts({ ...base, bodyStyle: 'hatchback' }), 'rear-cable-extension')
		).toBeUndefined();
	});
});

describe('camera supply', () => {
	it('lists the camera only when the installer supplies it', () => {
		// Source: the job contract — owner-supplied cameras are not the installer's part.
		expect(find(listParts(base), 'camera')).toBeUndefined();
		expect(find(listParts({ ...base, cameraSupply: 'installer' }), 'camera')?.quantity).toBe(1);
	});
});
