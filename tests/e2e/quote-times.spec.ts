import { expect, test } from './fixtures';

/** The first Sunday of a month (0-based) on or after today, as 'YYYY-MM-DD'. */
function nextFirstSunday(month: number): string {
	const now = new Date();
	for (let year = now.getUTCFullYear(); ; year++) {
		const first = new Date(Date.UTC(year, month, 1));
		const sunday = new Date(Date.UTC(year, month, 1 + ((7 - first.getUTCDay()) % 7)));
		if (sunday.getTime() > now.getTime()) return sunday.toISOString().slice(0, 10);
	}
}

test('a quote time the clocks skip is refused, and a repeated one asks which', async ({
	installerPage: page
}) => {
	// Source: IANA tz database, Australia/Adelaide — clocks go forward at 02:00 on the first Sunday
	// of October and back at 03:00 on the first Sunday of April.
	const forward = nextFirstSunday(9);
	const back = nextFirstSunday(3);
	await page.goto('/installer/jobs');
	await expect(page.getByTestId('board-status')).toHaveAttribute('data-source', 'map');
	// Any open job other than the hatch the marketplace test books.
	const row = page.getByTestId('job-row').filter({ hasNotText: '2018 Demo Hatch' }).first();
	await row.getByRole('link').first().click();
	const form = page.getByTestId('quote-form');
	await form.getByLabel('Time 1: date').fill(forward);
	await form.getByLabel('Time 1: start').fill('02:30');
	await expect(page.getByTestId('slot-clock-1')).toContainText('2:30 am did not happen that day');
	await form.getByLabel('Time 2: date').fill(back);
	await form.getByLabel('Time 2: start').fill('02:30');
	await expect(page.getByTestId('slot-clock-2')).toContainText('2:30 am happened twice');
	const which = form.getByLabel('Time 2: which one');
	await expect(which.locator('option')).toHaveText([
		'Choose…',
		'2:30 am ACDT (first)',
		'2:30 am ACST (second)'
	]);
	await which.selectOption('later');
	await form.getByRole('button', { name: /Send the/ }).click();
	await expect(
		form
			.getByRole('alert')
			.or(form.getByText(/Choose another time\./))
			.first()
	).toContainText(
		'went forward an hour at 2:00 am (ACST) to 3:00 am (ACDT), so 2:30 am did not happen that day. Choose another time.'
	);
});
