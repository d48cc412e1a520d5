ALTER TABLE "users" DROP CONSTRAINT "users_email_unique";--> statement-breakpoint
CREATE UNIQUE INDEX "users_school_email_idx" ON "users" USING btree ("school_id","email");--> statement-breakpoint
CREATE UNIQUE INDEX "users_joined_email_idx" ON "users" USING btree ("email") WHERE "users"."status" <> 'invited';