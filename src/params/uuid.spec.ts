import { describe, expect, it } from 'vitest';
import { match } from './uuid';

describe('uuid param matcher', () => {
	it('accepts canonical UUIDs in either case', () => {
		expect(match('0b9d5c1e-6a8e-4f1e-9a51-2c1f7d3e4b5a')).toBe(true);
		expect(match('0B9D5C1E-6A8E-4F1E-9A51-2C1F7D3E4B5A')).toBe(true);
	});

	it('refuses anything else, so the database never sees it', () => {
		for (const bad of [
			'',
			'new',
			'0b9d5c1e6a8e4f1e9a512c1f7d3e4b5a',
			'0b9d5c1e-6a8e-4f1e-9a51-2c1f7d3e4b5a ',
			'0b9d5c1e-6a8e-4f1e-9a51-2c1f7d3e4b5\u0000',
			"0b9d5c1e-6a8e-4f1e-9a51-2c1f7d3e4b5a' or 1=1"
		]) {
			expect(match(bad)).toBe(false);
		}
	});
});
