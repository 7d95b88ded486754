CREATE TRIGGER `audit_log_no_update` BEFORE UPDATE ON `audit_log` BEGIN SELECT RAISE(ABORT, 'audit_log rows cannot be changed'); END;
--> statement-breakpoint
CREATE TRIGGER `audit_log_no_delete` BEFORE DELETE ON `audit_log` BEGIN SELECT RAISE(ABORT, 'audit_log rows cannot be deleted'); END;
--> statement-breakpoint
CREATE TRIGGER `claim_events_no_update` BEFORE UPDATE ON `claim_events` BEGIN SELECT RAISE(ABORT, 'claim_events rows cannot be changed'); END;
--> statement-breakpoint
CREATE TRIGGER `claim_events_no_delete` BEFORE DELETE ON `claim_events` BEGIN SELECT RAISE(ABORT, 'claim_events rows cannot be deleted'); END;
