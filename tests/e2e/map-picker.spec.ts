import type { Locator } from '@playwright/test';
import { expect, test } from './fixtures';

/** The middle of an element on the screen. */
async function centreOf(locator: Locator) {
	const box = await locator.boundingBox();
	if (!box) throw new Error('not on screen');
	return { x: box.x + box.width / 2, y: box.y + box.height / 2 };
}

test('on the place step the pin, the map view and the suburb text agree', async ({
	ownerPage: page
}) => {
	await page.goto('/owner/jobs/new');
	await page.getByRole('button', { name: 'Start' }).click();
	await expect(page).toHaveURL(/\/vehicle$/);
	await page.goto(page.url().replace(/\/vehicle$/, '/place'));

	const map = page.getByTestId('map-picker');
	const pin = map.locator('.leaflet-marker-icon');
	const place = page.getByLabel('Suburb or postcode');

	// A look-up far from the map's starting centre (the city) shows the pin and moves the view
	// so the pin sits in the middle of the map.
	await place.fill('Semaphore');
	await page.getByRole('button', { name: 'Show on map' }).click();
	await expect(pin).toBeVisible();
	await expect(place).toHaveValue('Semaphore 5019');
	await expect
		.poll(async () => {
			const [p, m] = [await centreOf(pin), await centreOf(map)];
			// The pin's tip is its bottom; its box centre sits 11 px above the point.
			return Math.hypot(p.x - m.x, p.y + 11 - m.y);
		})
		.toBeLessThan(4);

	// Clicking elsewhere moves the pin, and the suburb text becomes the suburb at the new point.
	const before = await page.getByTestId('map-picker-point').textContent();
	const m = await centreOf(map);
	await page.mouse.click(m.x + 90, m.y - 60);
	await expect(page.getByTestId('map-picker-point')).not.toHaveText(before ?? '');
	const point = (await page.getByTestId('map-picker-point').textContent()) ?? '';
	const [, lat, lng] = /(-?\d+\.\d+), (-?\d+\.\d+)/.exec(point) ?? [];
	const answer = await page.request.get(`/api/places/reverse?lat=${lat}&lng=${lng}`);
	expect(answer.status()).toBe(200);
	const { place: there } = (await answer.json()) as {
		place: { suburb: string; postcode: string } | null;
	};
	expect(there).not.toBeNull();
	await expect(place).toHaveValue(`${there!.suburb} ${there!.postcode}`);
});

test("the service-area map zooms to show the installer's whole circle", async ({
	installerPage: page
}) => {
	await page.goto('/installer/service-area');
	const map = page.getByTestId('map-picker');
	const circle = map.locator('path.leaflet-interactive');
	await expect(circle).toBeVisible();
	await expect
		.poll(async () => {
			const [c, m] = [await circle.boundingBox(), await map.boundingBox()];
			if (!c || !m) return false;
			return (
				c.x >= m.x - 1 &&
				c.y >= m.y - 1 &&
				c.x + c.width <= m.x + m.width + 1 &&
				c.y + c.height <= m.y + m.height + 1
			);
		})
		.toBe(true);
});
