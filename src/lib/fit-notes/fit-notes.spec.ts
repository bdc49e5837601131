// Search normalisation, year ranges, standing words and the private-detail check of fit notes.
// Sources: Tapline's own rules (the fit notes issue); address and plate shapes from memory.
import { describe, expect, it } from 'vitest';
import {
	coversYear,
	privateDetailProblem,
	searchYear,
	standingText,
	vehicleKey,
	yearRangeText
} from './fit-notes';

describe('vehicleKey', () => {
	it('lower-cases, drops punctuation and accents, collapses spaces', () => {
		expect(vehicleKey('  Corvan   ASTER ')).toBe('corvan aster');
		expect(vehicleKey('Corvan Aster-X')).toBe('corvan aster x');
		expect(vehicleKey('Ménard Félise')).toBe('menard felise');
		expect(vehicleKey('Corvan/Aster (GX)')).toBe('corvan aster gx');
	});

	it('splits letters from digits so spacing does not matter', () => {
		expect(vehicleKey('Aster2')).toBe(vehicleKey('aster 2'));
		expect(vehicleKey('Tallis V8')).toBe('tallis v 8');
	});

	it('is empty for text with no letters or digits', () => {
		expect(vehicleKey(' -- ')).toBe('');
	});
});

describe('year ranges', () => {
	it('a note for 2015–2019 covers 2015, 2017 and 2019, not 2014 or 2020', () => {
		const note = { yearFrom: 2015, yearTo: 2019 };
		expect([2014, 2015, 2017, 2019, 2020].map((y) => coversYear(note, y))).toEqual([
			false,
			true,
			true,
			true,
			false
		]);
		expect(yearRangeText(2015, 2019)).toBe('2015–2019');
		expect(yearRangeText(2017, 2017)).toBe('2017');
	});

	it('reads a typed year, or none', () => {
		expect(searchYear('2017')).toBe(2017);
		expect(searchYear(' 2017 ')).toBe(2017);
		expect(searchYear('17')).toBeNull();
		expect(searchYear('1800')).toBeNull();
		expect(searchYear('')).toBeNull();
		expect(searchYear(null)).toBeNull();
	});
});

describe('standingText', () => {
	it('counts confirming fits and wrong marks', () => {
		expect(standingText(0, 0)).toBe('Not yet confirmed on another fit');
		expect(standingText(1, 0)).toBe('Confirmed on 1 other fit');
		expect(standingText(3, 1)).toBe('Confirmed on 3 other fits; marked wrong by 1');
	});
});

describe('privateDetailProblem', () => {
	it('passes trade notes with fuse numbers and ratings', () => {
		expect(privateDetailProblem('F23 (10 A) switched, F7 (15 A) permanent; mini blade')).toBeNull();
		expect(privateDetailProblem('Bolt behind the left kick panel, 10 mm head')).toBeNull();
		expect(
			privateDetailProblem('Stays live 20 minutes after locking; sleep timer 45 min')
		).toBeNull();
	});

	it('refuses phone numbers, e-mail addresses and links', () => {
		expect(privateDetailProblem('Call me on 0412 345 678')).toMatch(/phone numbers/);
		expect(privateDetailProblem('write to fitter@example.com')).toMatch(/phone numbers/);
		expect(privateDetailProblem('see www.example.com/fuses')).toMatch(/links/);
	});

	it('refuses a street address and a number plate', () => {
		expect(privateDetailProblem('Fitted at 14 Demo Court')).toMatch(/addresses/);
		expect(privateDetailProblem('car was rego ABC 123')).toMatch(/number plates/);
		expect(privateDetailProblem('plate: S123ABC')).toMatch(/number plates/);
	});
});
