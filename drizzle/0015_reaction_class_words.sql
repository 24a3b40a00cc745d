-- Reaction-class ids become kebab-case words (h_abstraction → hydrogen-abstraction, …). Documents
-- still open to change (drafts, submitted, in review, returned, declined) take the new id. Published
-- and retracted versions keep the id they were published with: their payload is frozen and its
-- SHA-256 is on record, so the freeze trigger stays as it is and screens read the retired ids
-- through the same table as the app (lib/deposits/vocabulary.ts, RETIRED_REACTION_CLASS_IDS).
UPDATE "dataset_versions"
  SET "payload" = jsonb_set("payload", '{reaction,class}', to_jsonb(m.new_id))
  FROM (VALUES
    ('h_abstraction', 'hydrogen-abstraction'),
    ('bond_fission', 'bond-fission'),
    ('disproportionation', 'radical-disproportionation'),
    ('electron_transfer', 'electron-transfer')
  ) AS m(old_id, new_id)
  WHERE "dataset_versions"."state" NOT IN ('published', 'retracted')
    AND "dataset_versions"."payload" -> 'reaction' ->> 'class' = m.old_id;
