-- The archive's search index (briefing_search) follows every briefing version through a trigger.
-- Content (text, hazards, area names, footprint) is captured while a version can still change;
-- once a version is issued, withdrawn or superseded only its status and issue time are updated,
-- so later edits of an area of interest never move an issued briefing on the map.
CREATE OR REPLACE FUNCTION briefing_search_upsert(b briefings, with_content boolean) RETURNS void AS $$
DECLARE
  ids integer[];
  names text[];
  shape geometry;
  hazard_list text[];
  doc tsvector;
  statements jsonb := CASE WHEN jsonb_typeof(b.statements) = 'array' THEN b.statements ELSE '[]'::jsonb END;
  thresholds jsonb := CASE WHEN jsonb_typeof(b.selection->'thresholds') = 'array' THEN b.selection->'thresholds' ELSE '[]'::jsonb END;
BEGIN
  IF NOT with_content THEN
    UPDATE briefing_search SET status = b.status, issued_at = b.issued_at, refreshed_at = now() WHERE briefing_id = b.id;
    IF FOUND THEN RETURN; END IF;
  END IF;
  SELECT coalesce(array_agg(DISTINCT v::integer), '{}') INTO ids
    FROM jsonb_array_elements_text(CASE WHEN jsonb_typeof(b.selection->'areaIds') = 'array' THEN b.selection->'areaIds' ELSE '[]'::jsonb END) AS v;
  SELECT coalesce(array_agg(DISTINCT n ORDER BY n), '{}') INTO names FROM (
    SELECT s->>'areaName' AS n FROM jsonb_array_elements(statements) AS s
    UNION SELECT a.name FROM areas a WHERE a.id = ANY(ids)
  ) AS x WHERE n IS NOT NULL AND n <> '';
  SELECT ST_Multi(ST_CollectionExtract(ST_Union(a.geometry), 3)) INTO shape FROM areas a WHERE a.id = ANY(ids);
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
  INSERT INTO briefing_search AS bs (briefing_id, status, issued_at, document, hazards, area_names, footprint, refreshed_at)
    VALUES (b.id, b.status, b.issued_at, doc, hazard_list, names, shape, now())
    ON CONFLICT (briefing_id) DO UPDATE SET status = EXCLUDED.status, issued_at = EXCLUDED.issued_at, document = EXCLUDED.document,
      hazards = EXCLUDED.hazards, area_names = EXCLUDED.area_names, footprint = EXCLUDED.footprint, refreshed_at = now();
END
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION briefing_search_refresh() RETURNS trigger AS $$
BEGIN
  PERFORM briefing_search_upsert(NEW, TG_OP = 'INSERT' OR OLD.status NOT IN ('issued', 'withdrawn', 'superseded'));
  RETURN NULL;
END
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER briefing_search_refresh AFTER INSERT OR UPDATE ON "briefings" FOR EACH ROW EXECUTE FUNCTION briefing_search_refresh();
--> statement-breakpoint
SELECT briefing_search_upsert(b, true) FROM briefings b;
