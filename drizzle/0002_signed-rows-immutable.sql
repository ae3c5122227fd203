-- Signed rows are immutable in the database itself (see app/db/immutability.ts).
CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures BEGIN SELECT RAISE(ABORT, 'a signature cannot be changed'); END;
--> statement-breakpoint
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures BEGIN SELECT RAISE(ABORT, 'a signature cannot be removed'); END;
--> statement-breakpoint
CREATE TRIGGER addenda_no_update BEFORE UPDATE ON addenda BEGIN SELECT RAISE(ABORT, 'an addendum cannot be changed'); END;
--> statement-breakpoint
CREATE TRIGGER addenda_no_delete BEFORE DELETE ON addenda BEGIN SELECT RAISE(ABORT, 'an addendum cannot be removed'); END;
--> statement-breakpoint
CREATE TRIGGER checkoff_evidence_no_update BEFORE UPDATE ON checkoff_evidence BEGIN SELECT RAISE(ABORT, 'evidence cannot be changed'); END;
--> statement-breakpoint
CREATE TRIGGER checkoff_evidence_no_delete BEFORE DELETE ON checkoff_evidence BEGIN SELECT RAISE(ABORT, 'evidence cannot be removed'); END;
--> statement-breakpoint
CREATE TRIGGER checkoffs_signed_no_update BEFORE UPDATE ON checkoffs WHEN OLD.signed_at IS NOT NULL AND NOT (OLD.status = 'signed' AND NEW.status = 'acknowledged' AND OLD.acknowledged_at IS NULL AND NEW.acknowledged_at IS NOT NULL AND NEW.id IS OLD.id AND NEW.org_id IS OLD.org_id AND NEW.person_id IS OLD.person_id AND NEW.checklist_version_id IS OLD.checklist_version_id AND NEW.preceptor_id IS OLD.preceptor_id AND NEW.assignment_id IS OLD.assignment_id AND NEW.outcome IS OLD.outcome AND NEW.practice_plan IS OLD.practice_plan AND NEW.practice_by IS OLD.practice_by AND NEW.content_hash IS OLD.content_hash AND NEW.started_at IS OLD.started_at AND NEW.signed_at IS OLD.signed_at AND NEW.created_at IS OLD.created_at) BEGIN SELECT RAISE(ABORT, 'a signed record cannot be changed: add a signed addendum instead'); END;
--> statement-breakpoint
CREATE TRIGGER checkoffs_signed_no_delete BEFORE DELETE ON checkoffs WHEN OLD.signed_at IS NOT NULL BEGIN SELECT RAISE(ABORT, 'a signed record cannot be changed: add a signed addendum instead'); END;
--> statement-breakpoint
CREATE TRIGGER checkoff_steps_signed_no_insert BEFORE INSERT ON checkoff_step_results WHEN (SELECT signed_at FROM checkoffs WHERE id = NEW.checkoff_id) IS NOT NULL BEGIN SELECT RAISE(ABORT, 'a signed record cannot be changed: add a signed addendum instead'); END;
--> statement-breakpoint
CREATE TRIGGER checkoff_steps_signed_no_update BEFORE UPDATE ON checkoff_step_results WHEN (SELECT signed_at FROM checkoffs WHERE id = OLD.checkoff_id) IS NOT NULL BEGIN SELECT RAISE(ABORT, 'a signed record cannot be changed: add a signed addendum instead'); END;
--> statement-breakpoint
CREATE TRIGGER checkoff_steps_signed_no_delete BEFORE DELETE ON checkoff_step_results WHEN (SELECT signed_at FROM checkoffs WHERE id = OLD.checkoff_id) IS NOT NULL BEGIN SELECT RAISE(ABORT, 'a signed record cannot be changed: add a signed addendum instead'); END;
