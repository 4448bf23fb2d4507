ALTER TABLE "briefing_search" ADD COLUMN "author_id" integer;--> statement-breakpoint
ALTER TABLE "briefing_search" ADD COLUMN "approved_by_id" integer;--> statement-breakpoint
ALTER TABLE "briefing_search" ADD COLUMN "list_ids" integer[] DEFAULT '{}'::int[] NOT NULL;--> statement-breakpoint
CREATE INDEX "briefing_search_author_idx" ON "briefing_search" USING btree ("author_id");--> statement-breakpoint
CREATE INDEX "briefing_search_approver_idx" ON "briefing_search" USING btree ("approved_by_id");--> statement-breakpoint
CREATE INDEX "briefing_search_lists_idx" ON "briefing_search" USING gin ("list_ids");--> statement-breakpoint
-- Author and approver copied into the index (filters without touching the wide briefings rows).
CREATE OR REPLACE FUNCTION briefing_search_upsert(b briefings, with_content boolean) RETURNS void AS $$
DECLARE
  ids integer[];
  names text[];
  shape geometry;
  hazard_list text[];
  doc tsvector;
  shapes jsonb;
  statements jsonb := CASE WHEN jsonb_typeof(b.statements) = 'array' THEN b.statements ELSE '[]'::jsonb END;
  thresholds jsonb := CASE WHEN jsonb_typeof(b.selection->'thresholds') = 'array' THEN b.selection->'thresholds' ELSE '[]'::jsonb END;
BEGIN
  IF NOT with_content THEN
    UPDATE briefing_search SET status = b.status, issued_at = b.issued_at, author_id = b.author_id, approved_by_id = b.approved_by_id, refreshed_at = now() WHERE briefing_id = b.id;
    IF FOUND THEN RETURN; END IF;
  END IF;
  SELECT coalesce(array_agg(DISTINCT v::integer), '{}') INTO ids
    FROM jsonb_array_elements_text(CASE WHEN jsonb_typeof(b.selection->'areaIds') = 'array' THEN b.selection->'areaIds' ELSE '[]'::jsonb END) AS v;
  SELECT coalesce(array_agg(DISTINCT n ORDER BY n), '{}') INTO names FROM (
    SELECT s->>'areaName' AS n FROM jsonb_array_elements(statements) AS s
    UNION SELECT a.name FROM areas a WHERE a.id = ANY(ids)
  ) AS x WHERE n IS NOT NULL AND n <> '';
  SELECT ST_Multi(ST_CollectionExtract(ST_Union(a.geometry), 3)) INTO shape FROM areas a WHERE a.id = ANY(ids);
  SELECT coalesce(jsonb_agg(jsonb_build_object('id', a.id, 'name', a.name, 'geometry', ST_AsGeoJSON(ST_ForcePolygonCCW(a.geometry), 6)::jsonb) ORDER BY a.name, a.id), '[]'::jsonb)
    INTO shapes FROM areas a WHERE a.id = ANY(ids);
  SELECT coalesce(array_agg(DISTINCT h ORDER BY h), '{}') INTO hazard_list FROM (
    SELECT t->>'hazard' AS h FROM jsonb_array_elements(thresholds) AS t
    UNION SELECT s->'threshold'->>'hazard' FROM jsonb_array_elements(statements) AS s
  ) AS x WHERE h IS NOT NULL AND h <> '';
  -- Weights: A title and headline, B areas and printed statements, C summary, D details, confidence, caveats.
  doc := setweight(to_tsvector('english', coalesce(b.title, '')), 'A')
    || setweight(to_tsvector('english', coalesce(b.narrative->>'headline', '')), 'A')
    || setweight(to_tsvector('english', array_to_string(names, ' ')), 'B')
    || setweight(jsonb_to_tsvector('english', coalesce(jsonb_path_query_array(statements, '$[*] ? (!(@.included == false)).text'), '[]'::jsonb), '["string"]'), 'B')
    || setweight(to_tsvector('english', coalesce(b.narrative->>'summary', '')), 'C')
    || setweight(to_tsvector('english', coalesce(b.narrative->>'details', '') || ' ' || coalesce(b.confidence_note, '')), 'D')
    || setweight(jsonb_to_tsvector('english',
         coalesce(jsonb_path_query_array(b.caveats, '$.snapshot[*].text'), '[]'::jsonb)
         || CASE WHEN jsonb_typeof(b.caveats->'free') = 'array' THEN b.caveats->'free' ELSE '[]'::jsonb END, '["string"]'), 'D');
  INSERT INTO briefing_search AS bs (briefing_id, status, issued_at, author_id, approved_by_id, document, hazards, area_names, footprint, area_shapes, refreshed_at)
    VALUES (b.id, b.status, b.issued_at, b.author_id, b.approved_by_id, doc, hazard_list, names, shape, shapes, now())
    ON CONFLICT (briefing_id) DO UPDATE SET status = EXCLUDED.status, issued_at = EXCLUDED.issued_at, author_id = EXCLUDED.author_id, approved_by_id = EXCLUDED.approved_by_id, document = EXCLUDED.document,
      hazards = EXCLUDED.hazards, area_names = EXCLUDED.area_names, footprint = EXCLUDED.footprint, area_shapes = EXCLUDED.area_shapes, refreshed_at = now();
END
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION briefing_search_lists_refresh() RETURNS trigger AS $$
DECLARE
  bid integer := CASE WHEN TG_OP = 'DELETE' THEN OLD.briefing_id ELSE NEW.briefing_id END;
BEGIN
  UPDATE briefing_search SET list_ids = coalesce((SELECT array_agg(list_id ORDER BY list_id) FROM briefing_lists WHERE briefing_id = bid), '{}')
    WHERE briefing_id = bid;
  RETURN NULL;
END
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER briefing_search_lists_refresh AFTER INSERT OR DELETE ON "briefing_lists" FOR EACH ROW EXECUTE FUNCTION briefing_search_lists_refresh();
--> statement-breakpoint
-- Searches read few rows each; parallel workers cost more to start than they save here.
ALTER TABLE "briefing_search" SET (parallel_workers = 0);
--> statement-breakpoint
UPDATE briefing_search s SET author_id = b.author_id, approved_by_id = b.approved_by_id,
  list_ids = coalesce((SELECT array_agg(list_id ORDER BY list_id) FROM briefing_lists l WHERE l.briefing_id = b.id), '{}')
  FROM briefings b WHERE b.id = s.briefing_id;
