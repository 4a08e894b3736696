-- Serials, fleet numbers and names sort as people read them: MB-2 before MB-10 (ICU's numeric ordering).
-- Used by ORDER BY … COLLATE natural_sort where lists and the Bay board sort by them; the columns keep the
-- database's collation, so equality, uniqueness and their indexes are unchanged.
CREATE COLLATION IF NOT EXISTS natural_sort (provider = icu, locale = 'und-u-kn-true');
