ALTER TABLE `decision_history` ADD `wording` text;--> statement-breakpoint
ALTER TABLE `decision_history` ADD `previous_decision` text DEFAULT 'undecided' NOT NULL;--> statement-breakpoint
ALTER TABLE `decisions` ADD `wording` text;