CREATE TYPE "public"."ledger_account" AS ENUM('platform_cash', 'owner_funds_held', 'installer_payable', 'fee_revenue', 'gst_payable');--> statement-breakpoint
CREATE TYPE "public"."ledger_kind" AS ENUM('payment', 'release', 'refund', 'late_fee', 'reversal');--> statement-breakpoint
CREATE TABLE "ledger_entry" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"transaction_id" uuid NOT NULL,
	"account" "ledger_account" NOT NULL,
	"booking_id" uuid,
	"amount_cents" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ledger_transaction" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "ledger_kind" NOT NULL,
	"booking_id" uuid,
	"reference" text NOT NULL,
	"reverses" uuid,
	"memo" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "notice" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text NOT NULL,
	"text" text NOT NULL,
	"link" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payment" (
	"booking_id" uuid PRIMARY KEY NOT NULL,
	"checkout_session_id" text,
	"checkout_url" text,
	"payment_intent_id" text,
	"charge_id" text,
	"paid_at" timestamp with time zone,
	"last_problem" text,
	"refunded_after_lapse_at" timestamp with time zone,
	"release_requested_at" timestamp with time zone,
	"released_at" timestamp with time zone,
	"transfer_id" text,
	"fee_cents" integer,
	"gst_on_fee_cents" integer,
	"payout_cents" integer,
	"last_release_error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_checkout_session_id_unique" UNIQUE("checkout_session_id"),
	CONSTRAINT "payment_payment_intent_id_unique" UNIQUE("payment_intent_id"),
	CONSTRAINT "payment_charge_id_unique" UNIQUE("charge_id"),
	CONSTRAINT "payment_transfer_id_unique" UNIQUE("transfer_id")
);
--> statement-breakpoint
CREATE TABLE "payment_event" (
	"event_id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "payout_account_id" text;--> statement-breakpoint
ALTER TABLE "installer_profile" ADD COLUMN "payouts_enabled" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "ledger_entry" ADD CONSTRAINT "ledger_entry_transaction_id_ledger_transaction_id_fk" FOREIGN KEY ("transaction_id") REFERENCES "public"."ledger_transaction"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ledger_entry" ADD CONSTRAINT "ledger_entry_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ledger_transaction" ADD CONSTRAINT "ledger_transaction_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notice" ADD CONSTRAINT "notice_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_booking_id_booking_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."booking"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "ledger_entry_transaction_idx" ON "ledger_entry" USING btree ("transaction_id");--> statement-breakpoint
CREATE INDEX "ledger_entry_booking_account_idx" ON "ledger_entry" USING btree ("booking_id","account");--> statement-breakpoint
CREATE UNIQUE INDEX "ledger_transaction_kind_reference_idx" ON "ledger_transaction" USING btree ("kind","reference");--> statement-breakpoint
CREATE INDEX "ledger_transaction_booking_idx" ON "ledger_transaction" USING btree ("booking_id");--> statement-breakpoint
CREATE INDEX "notice_user_idx" ON "notice" USING btree ("user_id","created_at");--> statement-breakpoint
ALTER TABLE "installer_profile" ADD CONSTRAINT "installer_profile_payout_account_id_unique" UNIQUE("payout_account_id");