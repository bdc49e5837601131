/**
 * Every table, one file per domain; drizzle-kit reads this folder (drizzle.config.ts).
 */
export * from './enums';
export * from './people';
export * from './platform';
export * from './marketplace';
export * from './work';
export * from './fit-notes';
export * from './money';
import type { booking, job, quote } from './marketplace';
import type { dispute, review } from './work';
import type { fitNote } from './fit-notes';
import type { installerProfile, user } from './people';
import type { ledgerTransaction } from './money';

export type User = typeof user.$inferSelect;
export type { UserRole as Role } from '../../../statuses';
export type InstallerProfile = typeof installerProfile.$inferSelect;
export type Job = typeof job.$inferSelect;
export type Quote = typeof quote.$inferSelect;
export type Booking = typeof booking.$inferSelect;
export type FitNote = typeof fitNote.$inferSelect;
export type { FitStage } from '../../../statuses';
export type Dispute = typeof dispute.$inferSelect;
export type { DisputeOutcome } from '../../../statuses';
export type { DisputeEventKind } from '../../../statuses';
export type Review = typeof review.$inferSelect;
export type LedgerTransaction = typeof ledgerTransaction.$inferSelect;
export type { JobStatus } from '../../../statuses';
export type { VettingStatus } from '../../../statuses';
