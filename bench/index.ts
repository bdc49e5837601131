/**
 * `npm run bench`: how long Tapline's hot computations take, as percentiles over many runs and as
 * ratios against a baseline measured in the same process (so machine speed cancels out).
 * Benchmarks report; they never fail a build. Tests never assert timings.
 */
import { hash } from '@node-rs/argon2';
import { maskContactDetails } from '../src/lib/masking';
import { computeScope, jobRequestSchema } from '../src/lib/scope';
import { SAMPLE_REQUEST } from '../seed/sample-request';

interface Stats {
	name: string;
	runs: number;
	p50: number;
	p95: number;
	p99: number;
}

function measure(name: string, runs: number, fn: () => unknown): Stats {
	for (let i = 0; i < Math.min(200, runs); i++) fn(); // warm-up for the JIT
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t0 = performance.now();
		fn();
		samples.push(performance.now() - t0);
	}
	samples.sort((a, b) => a - b);
	const at = (q: number) =>
		samples[Math.min(samples.length - 1, Math.floor(q * samples.length))] ?? 0;
	return { name, runs, p50: at(0.5), p95: at(0.95), p99: at(0.99) };
}

async function measureAsync(
	name: string,
	runs: number,
	fn: () => Promise<unknown>
): Promise<Stats> {
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t0 = performance.now();
		await fn();
		samples.push(performance.now() - t0);
	}
	samples.sort((a, b) => a - b);
	const at = (q: number) =>
		samples[Math.min(samples.length - 1, Math.floor(q * samples.length))] ?? 0;
	return { name, runs, p50: at(0.5), p95: at(0.95), p99: at(0.99) };
}

// The shared sample request, as a wagon with an AGM battery and stop-start.
const request = {
	...SAMPLE_REQUEST,
	model: 'Wagon',
	year: '2019',
	bodyStyle: 'wagon',
	batteryType: 'agm',
	batteryAh: 70,
	startStop: true
};

const baseline = measure('baseline: JSON round trip of the request', 20_000, () =>
	JSON.parse(JSON.stringify(request))
);
const parsed = jobRequestSchema.parse(request);
const results = [
	baseline,
	measure('validate a job request (zod)', 20_000, () => jobRequestSchema.parse(request)),
	measure('compute a scope sheet', 20_000, () => computeScope(parsed)),
	...maskingRuns(),
	await measureAsync('argon2id hash (sign-up, password reset)', 20, () =>
		hash('correct horse battery staple', { memoryCost: 19456, timeCost: 2, parallelism: 1 })
	)
];

/**
 * Contact masking on awkward messages (long dotted words with no '@', spelt-out dots with no
 * 'at', spaced digits) of doubling length. Linear work shows as a p50 ratio near 2 per doubling;
 * the quadratic patterns this replaced showed about 4.
 */
function maskingRuns(): Stats[] {
	const awkward = (n: number) =>
		('a.'.repeat(n / 8) + ' at ' + 'b dot '.repeat(n / 24) + '1 '.repeat(n / 8)).slice(0, n);
	const sizes = [1250, 2500, 5000, 10_000];
	// Warm every size first, so the JIT has settled before the smallest one is timed.
	for (let round = 0; round < 20; round++) for (const n of sizes) maskContactDetails(awkward(n));
	return sizes.map((n) => {
		const text = awkward(n);
		return measure(`mask contact details, ${String(n)} chars`, 200, () => maskContactDetails(text));
	});
}

const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(1)} µs` : `${ms.toFixed(2)} ms`);
console.log('\nTapline benchmarks (lower is faster)\n');
console.log(
	[
		'what'.padEnd(44),
		'runs'.padStart(6),
		'p50'.padStart(10),
		'p95'.padStart(10),
		'p99'.padStart(10),
		'p50 ÷ baseline'.padStart(16)
	].join(' ')
);
for (const r of results) {
	console.log(
		[
			r.name.padEnd(44),
			String(r.runs).padStart(6),
			fmt(r.p50).padStart(10),
			fmt(r.p95).padStart(10),
			fmt(r.p99).padStart(10),
			`${(r.p50 / baseline.p50).toFixed(1)}x`.padStart(16)
		].join(' ')
	);
}

const masking = results.filter((r) => r.name.startsWith('mask contact details'));
console.log('\nMasking: p50 ratio per doubling of the message (about 2 when linear)');
for (let i = 1; i < masking.length; i++) {
	const [before, after] = [masking[i - 1], masking[i]];
	if (before && after) {
		console.log(
			`  ${after.name.padEnd(40)} ${(after.p50 / before.p50).toFixed(2)}x the p50 of half the length`
		);
	}
}
