CREATE TABLE "accounts" (
	"id" text PRIMARY KEY NOT NULL,
	"account_id" text NOT NULL,
	"provider_id" text NOT NULL,
	"user_id" text NOT NULL,
	"access_token" text,
	"refresh_token" text,
	"id_token" text,
	"access_token_expires_at" timestamp,
	"refresh_token_expires_at" timestamp,
	"scope" text,
	"password" text,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"updated_at" timestamp NOT NULL
);
--> statement-breakpoint
CREATE TABLE "apikeys" (
	"id" text PRIMARY KEY NOT NULL,
	"config_id" text DEFAULT 'default' NOT NULL,
	"name" text,
	"start" text,
	"reference_id" text NOT NULL,
	"prefix" text,
	"key" text NOT NULL,
	"refill_interval" integer,
	"refill_amount" integer,
	"last_refill_at" timestamp,
	"enabled" boolean DEFAULT true,
	"rate_limit_enabled" boolean DEFAULT true,
	"rate_limit_time_window" integer DEFAULT 60000,
	"rate_limit_max" integer DEFAULT 600,
	"request_count" integer DEFAULT 0,
	"remaining" integer,
	"last_request" timestamp,
	"expires_at" timestamp,
	"created_at" timestamp NOT NULL,
	"updated_at" timestamp NOT NULL,
	"permissions" text,
	"metadata" text
);
--> statement-breakpoint
CREATE TABLE "invitations" (
	"id" text PRIMARY KEY NOT NULL,
	"organization_id" text NOT NULL,
	"email" text NOT NULL,
	"role" text,
	"status" text DEFAULT 'pending' NOT NULL,
	"expires_at" timestamp NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"inviter_id" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "members" (
	"id" text PRIMARY KEY NOT NULL,
	"organization_id" text NOT NULL,
	"user_id" text NOT NULL,
	"role" text DEFAULT 'member' NOT NULL,
	"created_at" timestamp NOT NULL
);
--> statement-breakpoint
CREATE TABLE "organizations" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"slug" text NOT NULL,
	"logo" text,
	"created_at" timestamp NOT NULL,
	"metadata" text,
	"time_zone" text DEFAULT 'UTC',
	CONSTRAINT "organizations_slug_unique" UNIQUE("slug")
);
--> statement-breakpoint
CREATE TABLE "rate_limits" (
	"id" text PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"count" integer NOT NULL,
	"last_request" bigint NOT NULL,
	CONSTRAINT "rate_limits_key_unique" UNIQUE("key")
);
--> statement-breakpoint
CREATE TABLE "sessions" (
	"id" text PRIMARY KEY NOT NULL,
	"expires_at" timestamp NOT NULL,
	"token" text NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"updated_at" timestamp NOT NULL,
	"ip_address" text,
	"user_agent" text,
	"user_id" text NOT NULL,
	"active_organization_id" text,
	CONSTRAINT "sessions_token_unique" UNIQUE("token")
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"email_verified" boolean DEFAULT false NOT NULL,
	"image" text,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"updated_at" timestamp DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_unique" UNIQUE("email")
);
--> statement-breakpoint
CREATE TABLE "verifications" (
	"id" text PRIMARY KEY NOT NULL,
	"identifier" text NOT NULL,
	"value" text NOT NULL,
	"expires_at" timestamp NOT NULL,
	"created_at" timestamp DEFAULT now() NOT NULL,
	"updated_at" timestamp DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "arms" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"key" text NOT NULL,
	"name" text NOT NULL,
	"planned_share" double precision NOT NULL,
	"is_holdout" boolean DEFAULT false NOT NULL,
	"position" smallint DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "arms_planned_share_check" CHECK ("arms"."planned_share" > 0 and "arms"."planned_share" < 1)
);
--> statement-breakpoint
CREATE TABLE "campaigns" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" text NOT NULL,
	"name" text NOT NULL,
	"slug" text NOT NULL,
	"hypothesis" text DEFAULT '' NOT NULL,
	"metric_kind" text NOT NULL,
	"metric_name" text NOT NULL,
	"metric_unit" text,
	"baseline_rate" double precision,
	"baseline_mean" double precision,
	"baseline_sd" double precision,
	"minimum_lift" double precision NOT NULL,
	"alpha" double precision NOT NULL,
	"power" double precision NOT NULL,
	"sides" smallint NOT NULL,
	"start_date" date NOT NULL,
	"max_days" integer NOT NULL,
	"daily_units" integer,
	"tau" double precision NOT NULL,
	"plan" jsonb NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"plan_changed_at" timestamp with time zone,
	"current_call" text DEFAULT 'collecting' NOT NULL,
	"counts_changed_at" timestamp with time zone,
	"analyzed_at" timestamp with time zone,
	"analysis_inputs_hash" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "campaigns_alpha_check" CHECK ("campaigns"."alpha" > 0 and "campaigns"."alpha" < 1),
	CONSTRAINT "campaigns_power_check" CHECK ("campaigns"."power" > 0 and "campaigns"."power" < 1),
	CONSTRAINT "campaigns_sides_check" CHECK ("campaigns"."sides" in (1, 2)),
	CONSTRAINT "campaigns_max_days_check" CHECK ("campaigns"."max_days" > 0),
	CONSTRAINT "campaigns_tau_check" CHECK ("campaigns"."tau" > 0)
);
--> statement-breakpoint
CREATE TABLE "daily_count_revisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"daily_count_id" uuid NOT NULL,
	"campaign_id" uuid NOT NULL,
	"arm_id" uuid NOT NULL,
	"day" date NOT NULL,
	"revision" integer NOT NULL,
	"units" integer NOT NULL,
	"sum" double precision NOT NULL,
	"sum_squares" double precision NOT NULL,
	"source" text NOT NULL,
	"batch_id" uuid,
	"replaced_by_batch_id" uuid,
	"replaced_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "daily_counts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"arm_id" uuid NOT NULL,
	"day" date NOT NULL,
	"units" integer NOT NULL,
	"sum" double precision NOT NULL,
	"sum_squares" double precision NOT NULL,
	"source" text NOT NULL,
	"batch_id" uuid,
	"revision" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "daily_counts_units_check" CHECK ("daily_counts"."units" >= 0),
	CONSTRAINT "daily_counts_sum_squares_check" CHECK ("daily_counts"."sum_squares" >= 0)
);
--> statement-breakpoint
CREATE TABLE "ingest_batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" text NOT NULL,
	"api_key_id" text,
	"user_id" text,
	"source" text NOT NULL,
	"idempotency_key" text NOT NULL,
	"request_hash" text NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"row_count" integer NOT NULL,
	"accepted" integer DEFAULT 0 NOT NULL,
	"replaced" integer DEFAULT 0 NOT NULL,
	"unchanged" integer DEFAULT 0 NOT NULL,
	"outcome" text NOT NULL,
	"response_status" integer NOT NULL,
	"response_body" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "analysis_days" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"day" date NOT NULL,
	"days_run" integer NOT NULL,
	"call" text NOT NULL,
	"lift_absolute" double precision,
	"lift_relative" double precision,
	"sequence_low" double precision,
	"sequence_high" double precision,
	"interval_low" double precision,
	"interval_high" double precision,
	"fixed_z" double precision,
	"fixed_p" double precision,
	"sequential_p" double precision,
	"srm_p" double precision,
	"srm_sequential_p" double precision,
	"peeking_cost" double precision,
	"health" jsonb NOT NULL,
	"detail" jsonb NOT NULL,
	"inputs_hash" text NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "alert_deliveries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"alert_id" uuid NOT NULL,
	"user_id" text,
	"email" text NOT NULL,
	"sent_at" timestamp with time zone,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "alert_rules" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" text NOT NULL,
	"calls" text[] DEFAULT '{"lift","harm","flat","horizon","suspect","collecting"}' NOT NULL,
	"default_recipient_roles" text[] DEFAULT '{"admin","lead"}' NOT NULL,
	"extra_recipients" text[] DEFAULT '{}' NOT NULL,
	"daily_digest" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "alerts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"from_call" text NOT NULL,
	"day" date NOT NULL,
	"transition" text NOT NULL,
	"snapshot" jsonb NOT NULL,
	"sent_at" timestamp with time zone,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "subscriptions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" text NOT NULL,
	"actor_user_id" text,
	"actor_api_key_id" text,
	"action" text NOT NULL,
	"target_type" text NOT NULL,
	"target_id" text NOT NULL,
	"reason" text,
	"detail" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "decisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"user_id" text,
	"outcome" text NOT NULL,
	"note" text NOT NULL,
	"call_at_decision" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "accounts" ADD CONSTRAINT "accounts_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_inviter_id_users_id_fk" FOREIGN KEY ("inviter_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "members" ADD CONSTRAINT "members_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "members" ADD CONSTRAINT "members_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sessions" ADD CONSTRAINT "sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "arms" ADD CONSTRAINT "arms_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "campaigns" ADD CONSTRAINT "campaigns_workspace_id_organizations_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "campaigns" ADD CONSTRAINT "campaigns_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_count_revisions" ADD CONSTRAINT "daily_count_revisions_daily_count_id_daily_counts_id_fk" FOREIGN KEY ("daily_count_id") REFERENCES "public"."daily_counts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_count_revisions" ADD CONSTRAINT "daily_count_revisions_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_count_revisions" ADD CONSTRAINT "daily_count_revisions_arm_id_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."arms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_count_revisions" ADD CONSTRAINT "daily_count_revisions_batch_id_ingest_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."ingest_batches"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_count_revisions" ADD CONSTRAINT "daily_count_revisions_replaced_by_batch_id_ingest_batches_id_fk" FOREIGN KEY ("replaced_by_batch_id") REFERENCES "public"."ingest_batches"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_counts" ADD CONSTRAINT "daily_counts_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_counts" ADD CONSTRAINT "daily_counts_arm_id_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."arms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_counts" ADD CONSTRAINT "daily_counts_batch_id_ingest_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."ingest_batches"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingest_batches" ADD CONSTRAINT "ingest_batches_workspace_id_organizations_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingest_batches" ADD CONSTRAINT "ingest_batches_api_key_id_apikeys_id_fk" FOREIGN KEY ("api_key_id") REFERENCES "public"."apikeys"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingest_batches" ADD CONSTRAINT "ingest_batches_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analysis_days" ADD CONSTRAINT "analysis_days_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_deliveries" ADD CONSTRAINT "alert_deliveries_alert_id_alerts_id_fk" FOREIGN KEY ("alert_id") REFERENCES "public"."alerts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_deliveries" ADD CONSTRAINT "alert_deliveries_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_rules" ADD CONSTRAINT "alert_rules_workspace_id_organizations_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alerts" ADD CONSTRAINT "alerts_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subscriptions" ADD CONSTRAINT "subscriptions_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subscriptions" ADD CONSTRAINT "subscriptions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_workspace_id_organizations_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_api_key_id_apikeys_id_fk" FOREIGN KEY ("actor_api_key_id") REFERENCES "public"."apikeys"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "accounts_user_id_idx" ON "accounts" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "apikeys_config_id_idx" ON "apikeys" USING btree ("config_id");--> statement-breakpoint
CREATE INDEX "apikeys_reference_id_idx" ON "apikeys" USING btree ("reference_id");--> statement-breakpoint
CREATE INDEX "apikeys_key_idx" ON "apikeys" USING btree ("key");--> statement-breakpoint
CREATE INDEX "invitations_organization_id_idx" ON "invitations" USING btree ("organization_id");--> statement-breakpoint
CREATE INDEX "invitations_email_idx" ON "invitations" USING btree ("email");--> statement-breakpoint
CREATE INDEX "members_organization_id_idx" ON "members" USING btree ("organization_id");--> statement-breakpoint
CREATE INDEX "members_user_id_idx" ON "members" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "members_organization_id_user_id_uidx" ON "members" USING btree ("organization_id","user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "organizations_slug_uidx" ON "organizations" USING btree ("slug");--> statement-breakpoint
CREATE INDEX "sessions_user_id_idx" ON "sessions" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "verifications_identifier_idx" ON "verifications" USING btree ("identifier");--> statement-breakpoint
CREATE UNIQUE INDEX "arms_campaign_id_key_uidx" ON "arms" USING btree ("campaign_id","key");--> statement-breakpoint
CREATE INDEX "arms_campaign_id_idx" ON "arms" USING btree ("campaign_id");--> statement-breakpoint
CREATE UNIQUE INDEX "campaigns_workspace_id_slug_uidx" ON "campaigns" USING btree ("workspace_id","slug");--> statement-breakpoint
CREATE INDEX "campaigns_workspace_id_idx" ON "campaigns" USING btree ("workspace_id");--> statement-breakpoint
CREATE INDEX "campaigns_created_by_idx" ON "campaigns" USING btree ("created_by");--> statement-breakpoint
CREATE INDEX "daily_count_revisions_daily_count_id_idx" ON "daily_count_revisions" USING btree ("daily_count_id");--> statement-breakpoint
CREATE INDEX "daily_count_revisions_campaign_id_idx" ON "daily_count_revisions" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "daily_count_revisions_arm_id_idx" ON "daily_count_revisions" USING btree ("arm_id");--> statement-breakpoint
CREATE INDEX "daily_count_revisions_batch_id_idx" ON "daily_count_revisions" USING btree ("batch_id");--> statement-breakpoint
CREATE INDEX "daily_count_revisions_replaced_by_batch_id_idx" ON "daily_count_revisions" USING btree ("replaced_by_batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "daily_counts_arm_id_day_uidx" ON "daily_counts" USING btree ("arm_id","day");--> statement-breakpoint
CREATE INDEX "daily_counts_campaign_id_idx" ON "daily_counts" USING btree ("campaign_id","day");--> statement-breakpoint
CREATE INDEX "daily_counts_arm_id_idx" ON "daily_counts" USING btree ("arm_id");--> statement-breakpoint
CREATE INDEX "daily_counts_batch_id_idx" ON "daily_counts" USING btree ("batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "ingest_batches_workspace_id_idempotency_key_uidx" ON "ingest_batches" USING btree ("workspace_id","idempotency_key");--> statement-breakpoint
CREATE INDEX "ingest_batches_workspace_id_idx" ON "ingest_batches" USING btree ("workspace_id");--> statement-breakpoint
CREATE INDEX "ingest_batches_api_key_id_idx" ON "ingest_batches" USING btree ("api_key_id");--> statement-breakpoint
CREATE INDEX "ingest_batches_user_id_idx" ON "ingest_batches" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "analysis_days_campaign_id_day_uidx" ON "analysis_days" USING btree ("campaign_id","day");--> statement-breakpoint
CREATE INDEX "analysis_days_campaign_id_idx" ON "analysis_days" USING btree ("campaign_id");--> statement-breakpoint
CREATE UNIQUE INDEX "alert_deliveries_alert_id_email_uidx" ON "alert_deliveries" USING btree ("alert_id","email");--> statement-breakpoint
CREATE INDEX "alert_deliveries_alert_id_idx" ON "alert_deliveries" USING btree ("alert_id");--> statement-breakpoint
CREATE INDEX "alert_deliveries_user_id_idx" ON "alert_deliveries" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "alert_rules_workspace_id_uidx" ON "alert_rules" USING btree ("workspace_id");--> statement-breakpoint
CREATE UNIQUE INDEX "alerts_campaign_id_transition_uidx" ON "alerts" USING btree ("campaign_id","transition");--> statement-breakpoint
CREATE INDEX "alerts_campaign_id_idx" ON "alerts" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "alerts_pending_idx" ON "alerts" USING btree ("sent_at","next_attempt_at");--> statement-breakpoint
CREATE UNIQUE INDEX "subscriptions_campaign_id_user_id_uidx" ON "subscriptions" USING btree ("campaign_id","user_id");--> statement-breakpoint
CREATE INDEX "subscriptions_campaign_id_idx" ON "subscriptions" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "subscriptions_user_id_idx" ON "subscriptions" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "audit_events_workspace_id_idx" ON "audit_events" USING btree ("workspace_id","created_at");--> statement-breakpoint
CREATE INDEX "audit_events_actor_user_id_idx" ON "audit_events" USING btree ("actor_user_id");--> statement-breakpoint
CREATE INDEX "audit_events_actor_api_key_id_idx" ON "audit_events" USING btree ("actor_api_key_id");--> statement-breakpoint
CREATE INDEX "decisions_campaign_id_idx" ON "decisions" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "decisions_user_id_idx" ON "decisions" USING btree ("user_id");