// Synthetic archive for the search benchmark: many invented briefing versions (issued, superseded,
// withdrawn) over six years, with invented places, areas, people and lists. Generated inside
// PostgreSQL (generate_series, random() after setseed) so 50 000 rows take well under a minute;
// the archive trigger indexes every row as it is inserted. Every synthetic row is marked
// (contact 'synthetic archive', series ids from 9 000 000) so it can be told apart and removed.
import { sql } from 'drizzle-orm'
import type { NodePgDatabase } from 'drizzle-orm/node-postgres'

export const SYNTHETIC_CONTACT = 'synthetic archive (invented)'
const SERIES_BASE = 9_000_000

// Invented names only.
export const SYNTHETIC_PLACES = [
  'Port Aveline', 'Miro Falls', 'Tessel Bay', 'Kaldor Pass', 'Brinmoor Meadows', 'Lowen', 'Sarrow Point', 'Quillan Ridge',
  'Ostra Vale', 'Hennet Cove', 'Dunmarra', 'Felsk Heights', 'Varro Sound', 'Ilden Flats', 'Corrie Fen', 'Maelstrand',
  'Tolve Crossing', 'Ashgrove Basin', 'Rennick Head', 'Yarlow Bridge', 'Pellam Moor', 'Skarn Inlet', 'Orrin Gap', 'Wendle Shore',
  'Cassen Weir', 'Baltry Downs', 'Emmet Quay', 'Harrow Tarn', 'Lisk Causeway', 'Thorne Spit', 'Ulver Hollow', 'Grisby Mouth',
]
const SECTORS = ['north', 'south', 'east', 'west', 'upper', 'lower', 'coast road', 'ferry berth', 'substation', 'campsite']
const HAZARDS = [
  { key: 'gust', noun: 'gusts', title: 'Strong gusts', event: 'gusts reach 20 m/s or more', value: 20, direction: 'above' },
  { key: 'low_temperature', noun: 'frost', title: 'Frost and ice', event: 'the temperature falls to 0 °C or below', value: 0, direction: 'below' },
  { key: 'heavy_precipitation', noun: 'rain', title: 'Heavy rain', event: '6-hour rain reaches 25 mm or more', value: 25, direction: 'above' },
  { key: 'heat', noun: 'heat', title: 'Heat', event: 'the temperature reaches 30 °C or more', value: 30, direction: 'above' },
]
const SENTENCES = [
  'Scenarios agree on the timing but differ on the strength.', 'The signal is strongest on exposed ground and weakest in sheltered valleys.',
  'Bridges and high-sided vehicles are most exposed during the afternoon.', 'A second band may follow overnight in about a third of the scenarios.',
  'Road surfaces can be colder than the air on clear, calm nights.', 'The ferry crossing is most affected near the harbour mouth.',
  'Rain gauges are sparse in the hills, so local totals are uncertain.', 'The outdoor stage area lies in the most exposed part of the site.',
  'Overhead lines across the ridge see the highest values.', 'Confidence is lower than usual because the ensemble spread is wide.',
  'Values near zero mean no scenario showed the event, not that it cannot happen.', 'The next run will sharpen the timing.',
  'Drainage culverts on the coast road fill quickly in such spells.', 'Winds ease from the west after dusk in most scenarios.',
  'The harbour approach may see short, steep seas.', 'Ice is most likely on bridges and untreated side roads.',
]
const CAVEATS = [
  'The probabilities are statistical detail added to a coarse ensemble forecast; they are not a warning.',
  'A value near 0 % means no scenario showed the outcome; it can still happen.',
  'Temperatures are for the air about 2 m above the ground; surfaces can be colder.',
  'Official warnings take precedence over this briefing.',
  'Decisions stay with the people responsible under your procedures.',
]

export interface ArchiveSeedResult { briefings: number; seconds: number; areas: number }

/** Literals written into the generated SQL (numbers and fixed strings of this file; no user input). */
const num = (n: number) => sql.raw(String(Number(n)))
const str = (v: string) => sql.raw(`'${v.replace(/'/g, "''")}'`)
const text = (list: string[]) => sql`${sql.raw(`ARRAY[${list.map((s) => `'${s.replace(/'/g, "''")}'`).join(',')}]::text[]`)}`

/** Adds synthetic rows until `count` synthetic briefing versions exist. */
export async function seedSyntheticArchive(db: NodePgDatabase<Record<string, unknown>>, count: number, log: (m: string) => void = () => {}): Promise<ArchiveSeedResult> {
  const started = Date.now()
  const have = Number((await db.execute(sql`select count(*)::int as n from briefings where contact = ${str(SYNTHETIC_CONTACT)}`)).rows[0]!.n)
  await db.execute(sql`select setseed(0.31)`)
  // People and lists (invented), then areas: small polygons spread over the invented region.
  await db.execute(sql`insert into users (email, display_name, role)
    select format('synthetic-%s-%s@archive.example', r, g), format('%s %s', (array['Ada','Boris','Cleo','Dario','Esme','Femi','Greta','Hugo'])[g], (array['Forecaster','Duty lead'])[case when r = 'lead' then 2 else 1 end]),
      (case when r = 'lead' then 'duty_lead' else 'forecaster' end)::role
    from generate_series(1, 8) g, unnest(array['forecaster', 'lead']) r on conflict do nothing`)
  await db.execute(sql`insert into distribution_lists (key, name, description)
    select format('synthetic-list-%s', g), format('Synthetic list %s (%s)', g, (${text(SYNTHETIC_PLACES)})[g]), 'Invented, for the archive benchmark'
    from generate_series(1, 12) g on conflict do nothing`)
  const areaCount = 320
  const existingAreas = Number((await db.execute(sql`select count(*)::int as n from areas where name like 'Synthetic %'`)).rows[0]!.n)
  if (existingAreas < areaCount) {
    await db.execute(sql`insert into areas (name, tags, geometry)
      select format('Synthetic %s %s', (${text(SYNTHETIC_PLACES)})[1 + g % ${num(SYNTHETIC_PLACES.length)}], (${text(SECTORS)})[1 + (g / ${num(SYNTHETIC_PLACES.length)}) % ${num(SECTORS.length)}]),
        array['synthetic'],
        ST_Multi(ST_MakeEnvelope(x, y, x + 0.1 + random() * 0.5, y + 0.1 + random() * 0.4, 4326))
      from (select g, -30 + random() * 12 as x, -49 + random() * 9 as y from generate_series(${num(existingAreas)}, ${num(areaCount - 1)}) g) s`)
  }
  const areaIds = (await db.execute(sql`select array_agg(id order by id) as ids from areas where name like 'Synthetic %'`)).rows[0]!.ids as number[]
  const users = (await db.execute(sql`select array_agg(id order by id) filter (where role = 'forecaster') as f, array_agg(id order by id) filter (where role = 'duty_lead') as l from users where email like 'synthetic-%@archive.example'`)).rows[0] as { f: number[]; l: number[] }
  const lists = (await db.execute(sql`select array_agg(id order by id) as ids, array_agg(name order by id) as names from distribution_lists where key like 'synthetic-list-%'`)).rows[0] as { ids: number[]; names: string[] }
  const areaNames = (await db.execute(sql`select array_agg(name order by id) as names from areas where name like 'Synthetic %'`)).rows[0]!.names as string[]
  const hz = sql.raw(`'${JSON.stringify(HAZARDS).replace(/'/g, "''")}'::jsonb`)
  const batch = 2500
  for (let done = have; done < count; done += batch) {
    const n = Math.min(batch, count - done)
    await db.execute(sql`
      with pick as (
        select g,
          ${hz} -> floor(random() * 4)::int as h,
          (${text(SYNTHETIC_PLACES)})[1 + floor(random() * ${num(SYNTHETIC_PLACES.length)})::int] as place,
          1 + floor(random() * ${num(areaIds.length)})::int as a1,
          1 + floor(random() * ${num(areaIds.length)})::int as a2,
          random() as p1, random() as p2, random() as st,
          timestamptz '2026-01-01 00:00:00+00' + random() * interval '2190 days' as issued,
          1 + floor(random() * 8)::int as who,
          (${text(SENTENCES)})[1 + floor(random() * ${num(SENTENCES.length)})::int] as s1,
          (${text(SENTENCES)})[1 + floor(random() * ${num(SENTENCES.length)})::int] as s2,
          (${text(SENTENCES)})[1 + floor(random() * ${num(SENTENCES.length)})::int] as s3,
          (${text(CAVEATS)})[2 + floor(random() * 4)::int] as cav
        from generate_series(${num(done)}, ${num(done + n - 1)}) g
      ), named as (
        select pick.*, (${sql.raw(`ARRAY[${areaIds.join(',')}]::int[]`)})[a1] as id1, (${sql.raw(`ARRAY[${areaIds.join(',')}]::int[]`)})[a2] as id2,
          (${text(areaNames)})[a1] as n1, (${text(areaNames)})[a2] as n2 from pick
      )
      insert into briefings (series_id, version, status, title, likelihood_scale, selection, narrative, confidence_note, contact, caveats, statements,
        figures, recipients, editor_ids, author_id, approved_by_id, approved_at, issued_at, issued_by_id, window_start, window_end, next_update_at,
        withdrawn_at, withdrawn_reason, local_time_name, utc_offset_minutes)
      select ${num(SERIES_BASE)} + g, 1,
        (case when st < 0.07 then 'withdrawn' when st < 0.15 then 'superseded' else 'issued' end)::briefing_status,
        format('%s on %s', h->>'title', place), 'plain',
        jsonb_build_object('leadFrom', 0, 'leadTo', 2, 'areaIds', jsonb_build_array(id1, id2), 'kinds', jsonb_build_array('anywhere'),
          'thresholds', jsonb_build_array(jsonb_build_object('hazard', h->>'key', 'label', h->>'title', 'value', (h->>'value')::numeric, 'direction', h->>'direction'))),
        jsonb_build_object('headline', format('%s %s near %s', (array['Some','Likely','Possible','Widespread','Patchy'])[1 + floor(p1 * 5)::int], h->>'noun', place),
          'summary', format('%s %s', s1, s2), 'details', s3),
        '', ${str(SYNTHETIC_CONTACT)},
        jsonb_build_object('libraryIds', '[]'::jsonb, 'free', '[]'::jsonb, 'snapshot', jsonb_build_array(
          jsonb_build_object('id', 1, 'title', 'Standing caution', 'text', ${str(CAVEATS[0]!)}, 'standing', true),
          jsonb_build_object('id', 2, 'title', 'Caveat', 'text', cav, 'standing', false))),
        jsonb_build_array(
          jsonb_build_object('key', 'a', 'areaId', id1, 'areaName', n1, 'kind', 'anywhere', 'value', round(p1::numeric, 2), 'count', round(p1 * 18), 'scenarios', 18, 'included', true,
            'threshold', jsonb_build_object('hazard', h->>'key', 'label', h->>'title', 'value', (h->>'value')::numeric, 'direction', h->>'direction'),
            'text', format('about %s %% (%s of 18 scenarios) that %s anywhere in %s', round(p1 * 100), round(p1 * 18), h->>'event', n1)),
          jsonb_build_object('key', 'b', 'areaId', id2, 'areaName', n2, 'kind', 'anywhere', 'value', round(p2::numeric, 2), 'count', round(p2 * 18), 'scenarios', 18, 'included', true,
            'threshold', jsonb_build_object('hazard', h->>'key', 'label', h->>'title', 'value', (h->>'value')::numeric, 'direction', h->>'direction'),
            'text', format('about %s %% (%s of 18 scenarios) that %s anywhere in %s', round(p2 * 100), round(p2 * 18), h->>'event', n2))),
        '[]'::jsonb, '[]'::jsonb, '{}'::int[],
        (${sql.raw(`ARRAY[${users.f.join(',')}]::int[]`)})[who], (${sql.raw(`ARRAY[${users.l.join(',')}]::int[]`)})[1 + (who % ${num(users.l.length)})], issued, issued,
        (${sql.raw(`ARRAY[${users.l.join(',')}]::int[]`)})[1 + (who % ${num(users.l.length)})],
        issued + interval '3 hours', issued + interval '15 hours', issued + interval '6 hours',
        case when st < 0.07 then issued + interval '2 hours' end, case when st < 0.07 then 'Issued with the wrong validity window.' end,
        'Serevan Coast time', -120
      from named`)
    // Lists each version was sent to: one or two of the synthetic lists.
    await db.execute(sql`insert into briefing_lists (briefing_id, list_id, list_name)
      select b.id, (${sql.raw(`ARRAY[${lists.ids.join(',')}]::int[]`)})[k], (${text(lists.names)})[k]
      from briefings b, lateral (select distinct 1 + ((b.id * m) % ${num(lists.ids.length)}) as k from generate_series(1, 1 + b.id % 2) m) l
      where b.series_id between ${num(SERIES_BASE + done)} and ${num(SERIES_BASE + done + n - 1)} on conflict do nothing`)
    log(`archive seed: ${done + n} of ${count}`)
  }
  await db.execute(sql`analyze briefings; analyze briefing_search; analyze briefing_lists`)
  return { briefings: count, seconds: (Date.now() - started) / 1000, areas: areaIds.length }
}
