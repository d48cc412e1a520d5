CREATE TABLE "prep_task_ticks" (
	"lesson_id" uuid NOT NULL,
	"task_key" text NOT NULL,
	"ticked_by" uuid,
	"ticked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "prep_task_ticks_lesson_id_task_key_pk" PRIMARY KEY("lesson_id","task_key")
);
--> statement-breakpoint
CREATE TABLE "tray_keys" (
	"lesson_id" uuid PRIMARY KEY NOT NULL,
	"nonce" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tray_lines" (
	"lesson_id" uuid NOT NULL,
	"group_number" integer NOT NULL,
	"part_code" text NOT NULL,
	"out" boolean DEFAULT false NOT NULL,
	"back" boolean DEFAULT false NOT NULL,
	"missing" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tray_lines_lesson_id_group_number_part_code_pk" PRIMARY KEY("lesson_id","group_number","part_code")
);
--> statement-breakpoint
CREATE TABLE "tray_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lesson_id" uuid NOT NULL,
	"group_number" integer NOT NULL,
	"nonce" text NOT NULL,
	"token_hash" text NOT NULL,
	"code_hash" text NOT NULL,
	"revoked_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tray_tokens_tokenHash_unique" UNIQUE("token_hash"),
	CONSTRAINT "tray_tokens_codeHash_unique" UNIQUE("code_hash")
);
--> statement-breakpoint
ALTER TABLE "prep_task_ticks" ADD CONSTRAINT "prep_task_ticks_lesson_id_lessons_id_fk" FOREIGN KEY ("lesson_id") REFERENCES "public"."lessons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prep_task_ticks" ADD CONSTRAINT "prep_task_ticks_ticked_by_users_id_fk" FOREIGN KEY ("ticked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tray_keys" ADD CONSTRAINT "tray_keys_lesson_id_lessons_id_fk" FOREIGN KEY ("lesson_id") REFERENCES "public"."lessons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tray_lines" ADD CONSTRAINT "tray_lines_lesson_id_lessons_id_fk" FOREIGN KEY ("lesson_id") REFERENCES "public"."lessons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tray_tokens" ADD CONSTRAINT "tray_tokens_lesson_id_lessons_id_fk" FOREIGN KEY ("lesson_id") REFERENCES "public"."lessons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "tray_tokens_lesson_idx" ON "tray_tokens" USING btree ("lesson_id");