-- The mark of the public pages' state, for the page cache of the front server (lib/html-cache.ts):
-- moved (nextval) by every invalidation of public data (lib/public-cache.ts invalidatePublicCache),
-- after the change committed and Next's data cache dropped what it changed, whichever process or
-- script made it. A kept page is served only while the mark it was kept under is the current one.
-- A sequence, not a row: moving it takes no lock and needs no transaction of its own.
CREATE SEQUENCE "public_pages_mark";
