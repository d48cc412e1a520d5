-- A unit's "Last changed" moves when one of its lessons, activities or materials changes, from
-- whichever route or job writes them. Reordering lessons (position only) is left out: the
-- reorder route stamps the unit itself, and leaving it out keeps that route, which locks the
-- unit before its lessons, from waiting in the opposite order to an activity save.
CREATE FUNCTION touch_unit(unit uuid) RETURNS void LANGUAGE sql AS $$
  UPDATE units SET updated_at = now() WHERE id = unit AND updated_at < now();
$$;
--> statement-breakpoint
CREATE FUNCTION touch_unit_of_lesson() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM touch_unit(COALESCE(NEW.unit_id, OLD.unit_id));
  IF TG_OP = 'UPDATE' AND NEW.unit_id IS DISTINCT FROM OLD.unit_id THEN
    PERFORM touch_unit(OLD.unit_id);
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE FUNCTION touch_unit_of_activity() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM touch_unit(l.unit_id) FROM lessons l WHERE l.id = COALESCE(NEW.lesson_id, OLD.lesson_id);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE FUNCTION touch_unit_of_material() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM touch_unit(l.unit_id)
     FROM activities a JOIN lessons l ON l.id = a.lesson_id
    WHERE a.id = COALESCE(NEW.activity_id, OLD.activity_id);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER lessons_touch_unit
  AFTER INSERT OR DELETE OR UPDATE OF unit_id, title, class_id, kit_type_id, starts_at, ends_at,
    period_id, room, group_size, learning_intention, success_criteria, relief_notes,
    relief_teacher_id
  ON lessons FOR EACH ROW EXECUTE FUNCTION touch_unit_of_lesson();
--> statement-breakpoint
CREATE TRIGGER activities_touch_unit
  AFTER INSERT OR UPDATE OR DELETE ON activities
  FOR EACH ROW EXECUTE FUNCTION touch_unit_of_activity();
--> statement-breakpoint
CREATE TRIGGER materials_touch_unit
  AFTER INSERT OR UPDATE OR DELETE ON materials
  FOR EACH ROW EXECUTE FUNCTION touch_unit_of_material();
