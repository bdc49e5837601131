import { describe, expect, it } from 'vitest';
import { DEFAULT_TILE_URL, tileSource, tileUrl } from './map-tiles';

describe('map tiles', () => {
	it('falls back to the local tiles fake', () => {
		expect(tileUrl(undefined)).toBe(DEFAULT_TILE_URL);
		expect(tileUrl('')).toBe(DEFAULT_TILE_URL);
		expect(tileSource(undefined)).toBe('http://127.0.0.1:2595');
	});

	it('gives the CSP source of a configured template, a wildcard for {s} subdomains', () => {
		expect(tileSource('http://127.0.0.1:3595/{z}/{x}/{y}.png')).toBe('http://127.0.0.1:3595');
		expect(tileSource('https://{s}.tiles.example.test/{z}/{x}/{y}.png')).toBe(
			'https://*.tiles.example.test'
		);
		expect(tileSource('/tiles/{z}/{x}/{y}.png')).toBeNull();
	});
});
