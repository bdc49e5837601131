import { index, integer, pgTable, primaryKey, smallint, text, uuid } from 'drizzle-orm/pg-core';
import { createdAt } from './columns';
import { installerProfile } from './people';
import { booking } from './marketplace';

/**
 * What an installer learned fitting one vehicle, published after a fit report for other vetted
 * installers: one note per booking. Vehicle facts only (make, model, year range, body style) and
 * trade know-how; never the owner, plate or address, and free text is refused when it carries
 * contact details ($lib/masking). `vehicleKey` is the normalised make and model
 * (vehicleKey in $lib/fit-notes/fit-notes) that search compares by trigram similarity; its GIN index and the
 * pg_trgm extension are in the hand-written migration fit-note-search.
 */
export const fitNote = pgTable(
	'fit_note',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.unique()
			.references(() => booking.id),
		authorId: text('author_id')
			.notNull()
			.references(() => installerProfile.userId),
		make: text('make').notNull(),
		model: text('model').notNull(),
		vehicleKey: text('vehicle_key').notNull(),
		yearFrom: smallint('year_from').notNull(),
		yearTo: smallint('year_to').notNull(),
		bodyStyle: text('body_style').notNull(),
		fuseBoxLocation: text('fuse_box_location').notNull(),
		fuseBoxAccess: text('fuse_box_access').notNull(),
		switchedFuse: text('switched_fuse').notNull(),
		switchedRatingAmps: smallint('switched_rating_amps').notNull(),
		permanentFuse: text('permanent_fuse'),
		permanentRatingAmps: smallint('permanent_rating_amps'),
		fuseFamily: text('fuse_family').notNull(),
		groundPoints: text('ground_points').notNull(),
		trimRemoval: text('trim_removal').notNull(),
		grommetRoute: text('grommet_route'),
		pitfalls: text('pitfalls'),
		/** From the fit report the note was published after. */
		minutesTaken: integer('minutes_taken').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('fit_note_body_year_idx').on(t.bodyStyle, t.yearFrom, t.yearTo),
		index('fit_note_created_idx').on(t.createdAt, t.id)
	]
);

/** Photos on a fit note (re-encoded by the upload pipeline: no EXIF, no GPS). */
export const fitNotePhoto = pgTable(
	'fit_note_photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		noteId: uuid('note_id')
			.notNull()
			.references(() => fitNote.id, { onDelete: 'cascade' }),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		bytes: integer('bytes').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('fit_note_photo_note_idx').on(t.noteId)]
);

/** Another vetted installer's verdict on a note from their own fit: one per installer per note. */
export const fitNoteMark = pgTable(
	'fit_note_mark',
	{
		noteId: uuid('note_id')
			.notNull()
			.references(() => fitNote.id, { onDelete: 'cascade' }),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		verdict: text('verdict', { enum: ['confirmed', 'wrong'] }).notNull(),
		comment: text('comment').notNull(),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.noteId, t.installerId] })]
);
