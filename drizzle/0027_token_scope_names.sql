-- Personal token scopes take the names the API documents: "read" → "deposit:read" (read what the
-- holder may see, their drafts included), "deposit" → "deposit:write" (create, replace and submit
-- drafts). "admin" keeps its name. Every stored token keeps exactly the rights it had.
UPDATE api_tokens SET scopes = ARRAY(
  SELECT DISTINCT CASE s WHEN 'read' THEN 'deposit:read' WHEN 'deposit' THEN 'deposit:write' ELSE s END
  FROM unnest(scopes) AS s ORDER BY 1
)
WHERE scopes && ARRAY['read', 'deposit']::text[];
