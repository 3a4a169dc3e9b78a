CREATE TABLE `user_tokens` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`kind` enum('invite','reset') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`expires_at` timestamp(3) NOT NULL,
	`used_at` timestamp(3),
	`created_by` bigint unsigned,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `user_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_tokens_hash_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `floorplan_uploads` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`version_id` bigint unsigned NOT NULL,
	`filename` varchar(255) NOT NULL,
	`mime` varchar(100) NOT NULL,
	`size` int NOT NULL,
	`bytes` longblob NOT NULL,
	`created_by` bigint unsigned,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `floorplan_uploads_id` PRIMARY KEY(`id`),
	CONSTRAINT `floorplan_uploads_version_uq` UNIQUE(`version_id`)
);
--> statement-breakpoint
CREATE TABLE `mission_notes` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`mission_id` bigint unsigned NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`step` int,
	`text` text NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `mission_notes_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `mission_photos` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`note_id` bigint unsigned NOT NULL,
	`mime` varchar(100) NOT NULL,
	`width` int NOT NULL,
	`height` int NOT NULL,
	`bytes` longblob NOT NULL,
	`thumb` longblob NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `mission_photos_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `caught_mail` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`from_addr` varchar(254) NOT NULL,
	`to_addrs` json NOT NULL,
	`subject` varchar(300) NOT NULL,
	`text` text,
	`html` text,
	`received_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `caught_mail_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `users` ADD `on_call` boolean DEFAULT false NOT NULL;--> statement-breakpoint
CREATE INDEX `user_tokens_user_idx` ON `user_tokens` (`user_id`);--> statement-breakpoint
CREATE INDEX `mission_notes_mission_idx` ON `mission_notes` (`mission_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `mission_photos_note_idx` ON `mission_photos` (`note_id`);--> statement-breakpoint
CREATE INDEX `caught_mail_received_idx` ON `caught_mail` (`received_at`);