CREATE TABLE `floorplan_versions` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`floorplan_id` bigint unsigned NOT NULL,
	`version` int NOT NULL,
	`rows` int NOT NULL,
	`cols` int NOT NULL,
	`tile_m` double NOT NULL,
	`layers` longblob NOT NULL,
	`note` text,
	`created_by` bigint unsigned,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `floorplan_versions_id` PRIMARY KEY(`id`),
	CONSTRAINT `floorplan_versions_uq` UNIQUE(`floorplan_id`,`version`)
);
--> statement-breakpoint
CREATE TABLE `floorplans` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`name` varchar(120) NOT NULL,
	`is_default` int NOT NULL DEFAULT 0,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `floorplans_id` PRIMARY KEY(`id`),
	CONSTRAINT `floorplans_name_uq` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `missions` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`robot_id` varchar(40) NOT NULL,
	`version_id` bigint unsigned NOT NULL,
	`goal_row` int NOT NULL,
	`goal_col` int NOT NULL,
	`state` enum('active','reached','aborted','failed') NOT NULL DEFAULT 'active',
	`steps` int NOT NULL DEFAULT 0,
	`holds` int NOT NULL DEFAULT 0,
	`min_certainty` double,
	`created_by` bigint unsigned,
	`started_at` timestamp(3) NOT NULL DEFAULT (now()),
	`ended_at` timestamp(3),
	CONSTRAINT `missions_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `policies` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`version_id` bigint unsigned NOT NULL,
	`goal_row` int NOT NULL,
	`goal_col` int NOT NULL,
	`model_hash` varchar(64) NOT NULL,
	`value` longblob NOT NULL,
	`action` longblob NOT NULL,
	`compute_ms` int NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `policies_id` PRIMARY KEY(`id`),
	CONSTRAINT `policies_key_uq` UNIQUE(`version_id`,`goal_row`,`goal_col`,`model_hash`)
);
--> statement-breakpoint
CREATE TABLE `beliefs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`robot_id` varchar(40) NOT NULL,
	`event_id` bigint unsigned NOT NULL,
	`mission_id` bigint unsigned,
	`version_id` bigint unsigned NOT NULL,
	`belief` longblob NOT NULL,
	`tile_mass` double NOT NULL,
	`entropy` double NOT NULL,
	`created_at` timestamp(3) NOT NULL,
	CONSTRAINT `beliefs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`robot_id` varchar(40) NOT NULL,
	`seq` bigint unsigned,
	`mission_id` bigint unsigned,
	`source` enum('robot','server','operator') NOT NULL,
	`kind` varchar(24) NOT NULL,
	`payload` json NOT NULL,
	`robot_at` bigint,
	`received_at` timestamp(3) NOT NULL,
	CONSTRAINT `events_id` PRIMARY KEY(`id`),
	CONSTRAINT `events_robot_seq_uq` UNIQUE(`robot_id`,`seq`)
);
--> statement-breakpoint
CREATE TABLE `alerts` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`robot_id` varchar(40),
	`mission_id` bigint unsigned,
	`kind` enum('low_certainty','offline','fault','traffic','battery') NOT NULL,
	`message` text NOT NULL,
	`ack_by` bigint unsigned,
	`ack_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `alerts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `audit` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` bigint unsigned,
	`action` varchar(60) NOT NULL,
	`target` varchar(120) NOT NULL,
	`detail` json,
	`at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `audit_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE INDEX `missions_robot_idx` ON `missions` (`robot_id`,`started_at`);--> statement-breakpoint
CREATE INDEX `missions_state_idx` ON `missions` (`state`,`started_at`);--> statement-breakpoint
CREATE INDEX `beliefs_robot_idx` ON `beliefs` (`robot_id`,`event_id`);--> statement-breakpoint
CREATE INDEX `beliefs_mission_idx` ON `beliefs` (`mission_id`,`event_id`);--> statement-breakpoint
CREATE INDEX `events_mission_idx` ON `events` (`mission_id`,`id`);--> statement-breakpoint
CREATE INDEX `events_robot_idx` ON `events` (`robot_id`,`id`);--> statement-breakpoint
CREATE INDEX `alerts_created_idx` ON `alerts` (`created_at`);--> statement-breakpoint
CREATE INDEX `audit_at_idx` ON `audit` (`at`);