import { describe, expect, it } from 'vitest';
import {
	BLADE_FUSE_RATINGS,
	FUSE_FAMILY_RANGES,
	fuseColour,
	fuseForAccessory,
	nextStandardRating
} from './fuses';

describe('blade fuse colours', () => {
	it('matches the published colour code for 1–20 A', () => {
		// Source: ISO 8820-3 and blade fuse colour reference tables (published; sources agree).
		expect(fuseColour(1)).toBe('black');
		expect(fuseColour(2)).toBe('grey');
		expect(fuseColour(3)).toBe('violet');
		expect(fuseColour(5)).toBe('tan');
		expect(fuseColour(7.5)).toBe('brown');
		expect(fuseColour(10)).toBe('red');
		expect(fuseColour(15)).toBe('blue');
		expect(fuseColour(20)).toBe('yellow');
	});

	it('carries the from-memory colours and marks them so', () => {
		// Source: from memory (4 A pink, 25 A natural, 30 A green, 35 A blue-green, 40 A orange).
		expect(fuseColour(4)).toBe('pink');
		expect(fuseColour(30)).toBe('green');
		const memory = BLADE_FUSE_RATINGS.filter((r) => r.source === 'memory').map((r) => r.amps);
		expect(memory).toEqual([4, 25, 30, 35, 40]);
	});

	it('has no colour for a non-standard rating', () => {
		// Source: ISO 8820-3 rating series has no 6 A blade.
		expect(fuseColour(6)).toBeUndefined();
	});
});

describe('nextStandardRating', () => {
	it('rounds up to the next rating in the series', () => {
		// Source: ISO 8820-3 rating series 1, 2, 3, 4, 5, 7.5, 10, 15, 20 … (common trade practice).
		expect(nextStandardRating(0.5, 'mini')).toBe(2);
		expect(nextStandardRating(2, 'standard')).toBe(2);
		expect(nextStandardRating(2.01, 'standard')).toBe(3);
		expect(nextStandardRating(5.1, 'standard')).toBe(7.5);
		expect(nextStandardRating(12, 'mini')).toBe(15);
	});

	it('keeps within the family range', () => {
		// Source: from memory — micro2 made in 5–30 A, micro3 in 5–15 A.
		expect(FUSE_FAMILY_RANGES.micro2).toMatchObject({ minAmps: 5, maxAmps: 30 });
		expect(FUSE_FAMILY_RANGES.micro3).toMatchObject({ minAmps: 5, maxAmps: 15 });
		expect(nextStandardRating(1, 'micro2')).toBe(5);
		expect(nextStandardRating(16, 'micro3')).toBeUndefined();
		expect(nextStandardRating(16, 'micro2')).toBe(20);
	});
});

describe('fuseForAccessory', () => {
	it('gives 2 A for a typical front + rear camera', () => {
		// Source: common trade practice — 1.25 x 0.5 A = 0.625 A, floor 2 A; 2 A is grey (ISO 8820-3).
		expect(fuseForAccessory(0.5)).toEqual({ amps: 2, colour: 'grey', suitable: true, notes: [] });
	});

	it('rounds 1.25 x draw up to the next rating', () => {
		// Source: common trade practice — 1.25 x 2 A = 2.5 A -> 3 A; 1.25 x 3.2 A = 4 A -> 4 A.
		expect(fuseForAccessory(2).amps).toBe(3);
		// 1.25 x 1.7 A = 2.125 A, just over 2 A -> 3 A.
		expect(fuseForAccessory(1.7).amps).toBe(3);
		expect(fuseForAccessory(3.2).amps).toBe(4);
		// 1.25 x 4 A = 5 A exactly; must not be pushed to 7.5 A by float error.
		expect(fuseForAccessory(4).amps).toBe(5);
	});

	it('flags a rating above the usual 2–5 A', () => {
		// Source: common trade practice — 1.25 x 4.5 A = 5.625 A -> 7.5 A, above the dash-cam norm.
		const fuse = fuseForAccessory(4.5);
		expect(fuse.amps).toBe(7.5);
		expect(fuse.notes).toHaveLength(1);
	});

	it('never exceeds the fuse of the tapped circuit', () => {
		// Source: common trade practice — the added fuse must not exceed the slot's own fuse.
		// A 1 A slot still covers 1.25 x 0.3 A = 0.375 A, so the 2 A floor gives way.
		expect(fuseForAccessory(0.3, 1).amps).toBe(1);
		const tooSmall = fuseForAccessory(2, 2);
		expect(tooSmall.suitable).toBe(false);
		expect(tooSmall.amps).toBeUndefined();
	});

	it('uses the family minimum for micro2 taps', () => {
		// Source: from memory — micro2 starts at 5 A, so the added fuse is 5 A.
		expect(fuseForAccessory(0.5, undefined, 'micro2').amps).toBe(5);
	});

	it('rejects a non-positive draw', () => {
		// Source: circuit sense — an accessory with no draw needs no fuse sizing.
		expect(() => fuseForAccessory(0)).toThrow(RangeError);
	});
});
