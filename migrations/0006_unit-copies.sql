CREATE TABLE "unit_copies" (
	"unit_id" uuid PRIMARY KEY NOT NULL,
	"source_unit_id" uuid NOT NULL,
	"source_version" integer NOT NULL,
	"source_title" text NOT NULL,
	"source_owner_name" text NOT NULL,
	"copied_at" timestamp with time zone DEFAULT now() NOT NULL,
	"snapshot" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "unit_copies" ADD CONSTRAINT "unit_copies_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;