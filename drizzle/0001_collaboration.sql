CREATE TABLE "doc_states" (
	"mechanism_id" text PRIMARY KEY NOT NULL,
	"state" "bytea" NOT NULL,
	"through_update" bigint NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "doc_updates" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"mechanism_id" text NOT NULL,
	"update" "bytea" NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "snapshots" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "snapshots_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"mechanism_id" text NOT NULL,
	"kind" text NOT NULL,
	"name" text,
	"source" text NOT NULL,
	"state" "bytea" NOT NULL,
	"summary" jsonb NOT NULL,
	"author_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "doc_states" ADD CONSTRAINT "doc_states_mechanism_id_mechanisms_id_fk" FOREIGN KEY ("mechanism_id") REFERENCES "public"."mechanisms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "doc_updates" ADD CONSTRAINT "doc_updates_mechanism_id_mechanisms_id_fk" FOREIGN KEY ("mechanism_id") REFERENCES "public"."mechanisms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "snapshots" ADD CONSTRAINT "snapshots_mechanism_id_mechanisms_id_fk" FOREIGN KEY ("mechanism_id") REFERENCES "public"."mechanisms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "snapshots" ADD CONSTRAINT "snapshots_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "doc_updates_mechanism_idx" ON "doc_updates" USING btree ("mechanism_id","id");--> statement-breakpoint
CREATE INDEX "snapshots_mechanism_idx" ON "snapshots" USING btree ("mechanism_id","at");