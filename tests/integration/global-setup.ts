// Prepares PostgreSQL for the integration project: the test cluster (started if needed) and a
// migrated template database that each test file copies. `npm test` passes its own template in
// TEST_TEMPLATE_DATABASE; `npm run test:integration` alone makes (and afterwards drops) one.
import type { TestProject } from 'vitest/node';
import { loadConfig } from '../../scripts/lib/config.mjs';
import { ensureCluster } from '../../scripts/lib/postgres.mjs';
import { dropDatabase, ensureDatabase, migrateDatabase } from '../../scripts/lib/database.mjs';

declare module 'vitest' {
	export interface ProvidedContext {
		adminDatabaseUrl: string;
		templateDatabase: string;
		databaseUrlPrefix: string;
	}
}

export default async function setup(project: TestProject) {
	const config = loadConfig('test');
	const given = process.env.TEST_TEMPLATE_DATABASE;
	const cluster = given ? { stop: () => {} } : ensureCluster(config);
	const template = given ?? `tapline_t${Date.now().toString(36)}${process.pid}_template`;
	if (!given) {
		await ensureDatabase(config.adminUrl, template);
		await migrateDatabase(config.dbUrl(template));
	}
	project.provide('adminDatabaseUrl', config.adminUrl);
	project.provide('templateDatabase', template);
	project.provide('databaseUrlPrefix', config.dbUrl(''));
	return async () => {
		if (!given) await dropDatabase(config.adminUrl, template);
		cluster.stop();
	};
}
