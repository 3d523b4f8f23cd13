-- Keys and indexes a count write paid for and nothing reads: see the comments on daily_counts and
-- daily_count_revisions in db/schema/counts.ts (a revision keeps its key to the count it belongs to).
ALTER TABLE "daily_count_revisions" DROP CONSTRAINT "daily_count_revisions_campaign_id_campaigns_id_fk";
--> statement-breakpoint
ALTER TABLE "daily_count_revisions" DROP CONSTRAINT "daily_count_revisions_arm_id_arms_id_fk";
--> statement-breakpoint
ALTER TABLE "daily_count_revisions" DROP CONSTRAINT "daily_count_revisions_batch_id_ingest_batches_id_fk";
--> statement-breakpoint
ALTER TABLE "daily_count_revisions" DROP CONSTRAINT "daily_count_revisions_replaced_by_batch_id_ingest_batches_id_fk";
--> statement-breakpoint
ALTER TABLE "daily_counts" DROP CONSTRAINT "daily_counts_batch_id_ingest_batches_id_fk";
--> statement-breakpoint
DROP INDEX "daily_count_revisions_campaign_id_idx";--> statement-breakpoint
DROP INDEX "daily_count_revisions_arm_id_idx";--> statement-breakpoint
DROP INDEX "daily_count_revisions_batch_id_idx";--> statement-breakpoint
DROP INDEX "daily_count_revisions_replaced_by_batch_id_idx";--> statement-breakpoint
DROP INDEX "daily_counts_arm_id_idx";--> statement-breakpoint
DROP INDEX "daily_counts_batch_id_idx";--> statement-breakpoint
-- Room on each page for a new version of every row on it, so a replaced count stays a HOT update
-- (no index covers a column it writes). Applies to pages written from now on.
ALTER TABLE "daily_counts" SET (fillfactor = 50);
