CREATE TABLE "reminder_preferences" (
	"user_id" uuid PRIMARY KEY NOT NULL,
	"charge_reminders" boolean DEFAULT false NOT NULL,
	"lead_minutes" integer DEFAULT 30 NOT NULL,
	"morning_summary" boolean DEFAULT false NOT NULL,
	"summary_time" text DEFAULT '07:00' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sent_reminders" (
	"user_id" uuid NOT NULL,
	"reminder_key" text NOT NULL,
	"kind" text NOT NULL,
	"lesson_id" uuid,
	"due_at" timestamp with time zone NOT NULL,
	"sent_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sent_reminders_user_id_reminder_key_pk" PRIMARY KEY("user_id","reminder_key")
);
--> statement-breakpoint
ALTER TABLE "reminder_preferences" ADD CONSTRAINT "reminder_preferences_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sent_reminders" ADD CONSTRAINT "sent_reminders_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sent_reminders" ADD CONSTRAINT "sent_reminders_lesson_id_lessons_id_fk" FOREIGN KEY ("lesson_id") REFERENCES "public"."lessons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "sent_reminders_sent_at_idx" ON "sent_reminders" USING btree ("sent_at");