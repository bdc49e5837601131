// Stands in for `$env/dynamic/private` in integration tests. SvelteKit's own module is a snapshot
// taken when Vitest starts; each test file sets DATABASE_URL to its own database afterwards.
export const env: Record<string, string | undefined> = process.env;
