CREATE INDEX `missions_started_idx` ON `missions` (`started_at`,`id`);--> statement-breakpoint
CREATE INDEX `missions_version_idx` ON `missions` (`version_id`,`started_at`);