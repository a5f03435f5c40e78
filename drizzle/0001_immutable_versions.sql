-- Saved versions are immutable (DESIGN.md): refuse UPDATE on them at the database level,
-- whatever code path tries it. Deleting follows the owning row (ON DELETE CASCADE).
CREATE OR REPLACE FUNCTION phasewright_refuse_update() RETURNS trigger AS $$
BEGIN
	RAISE EXCEPTION '% rows are immutable: save a new version instead', TG_TABLE_NAME USING ERRCODE = 'check_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER template_versions_immutable BEFORE UPDATE ON template_versions FOR EACH ROW EXECUTE FUNCTION phasewright_refuse_update();
--> statement-breakpoint
CREATE TRIGGER recipe_versions_immutable BEFORE UPDATE ON recipe_versions FOR EACH ROW EXECUTE FUNCTION phasewright_refuse_update();
