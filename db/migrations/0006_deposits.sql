CREATE TYPE "public"."deposit_move" AS ENUM('payment', 'refund');--> statement-breakpoint
CREATE TYPE "public"."deposit_rule" AS ENUM('none', 'percent', 'fixed');--> statement-breakpoint
CREATE TYPE "public"."deposit_status" AS ENUM('requested', 'paid', 'refund_pending', 'refunded');--> statement-breakpoint
CREATE TABLE "deposit_moves" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"deposit_id" uuid NOT NULL,
	"kind" "deposit_move" NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"event_id" text,
	"provider_ref" text NOT NULL,
	"occurred_at" timestamp with time zone NOT NULL,
	"recorded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "deposit_moves_event_id_unique" UNIQUE("event_id")
);
--> statement-breakpoint
CREATE TABLE "deposits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"order_id" uuid NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"status" "deposit_status" DEFAULT 'requested' NOT NULL,
	"link_token" text NOT NULL,
	"checkout_session_id" text,
	"payment_intent_id" text,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"paid_at" timestamp with time zone,
	"refunded_at" timestamp with time zone,
	CONSTRAINT "deposits_link_token_unique" UNIQUE("link_token"),
	CONSTRAINT "deposits_checkout_session_id_unique" UNIQUE("checkout_session_id")
);
--> statement-breakpoint
ALTER TABLE "shops" ADD COLUMN "deposit_rule" "deposit_rule" DEFAULT 'none' NOT NULL;--> statement-breakpoint
ALTER TABLE "shops" ADD COLUMN "deposit_percent" integer;--> statement-breakpoint
ALTER TABLE "shops" ADD COLUMN "deposit_fixed_minor" integer;--> statement-breakpoint
ALTER TABLE "deposit_moves" ADD CONSTRAINT "deposit_moves_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deposit_moves" ADD CONSTRAINT "deposit_moves_deposit_id_deposits_id_fk" FOREIGN KEY ("deposit_id") REFERENCES "public"."deposits"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deposit_moves" ADD CONSTRAINT "deposit_moves_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deposits" ADD CONSTRAINT "deposits_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deposits" ADD CONSTRAINT "deposits_order_id_orders_id_fk" FOREIGN KEY ("order_id") REFERENCES "public"."orders"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "deposit_moves_kind_ref_key" ON "deposit_moves" USING btree ("kind","provider_ref");--> statement-breakpoint
CREATE INDEX "deposit_moves_shop_time_idx" ON "deposit_moves" USING btree ("shop_id","occurred_at");--> statement-breakpoint
CREATE INDEX "deposit_moves_deposit_idx" ON "deposit_moves" USING btree ("deposit_id");--> statement-breakpoint
CREATE INDEX "deposits_shop_order_idx" ON "deposits" USING btree ("shop_id","order_id");--> statement-breakpoint
CREATE INDEX "deposits_payment_intent_idx" ON "deposits" USING btree ("payment_intent_id");