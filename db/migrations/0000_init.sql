CREATE TABLE `users` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(120) NOT NULL,
	`role` enum('viewer','operator','admin') NOT NULL DEFAULT 'viewer',
	`password_hash` varchar(100) NOT NULL,
	`disabled_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_uq` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `robots` (
	`id` varchar(40) NOT NULL,
	`name` varchar(80) NOT NULL,
	`key_hash` varchar(128) NOT NULL,
	`drive` enum('differential','bicycle') NOT NULL DEFAULT 'differential',
	`model` varchar(80) NOT NULL DEFAULT '',
	`sensors` json NOT NULL,
	`settings` json,
	`simulated` boolean NOT NULL DEFAULT false,
	`floorplan_id` bigint unsigned,
	`retired_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `robots_id` PRIMARY KEY(`id`)
);
