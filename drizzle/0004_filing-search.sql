-- Search of the review queue (address, city, permit number, rater) by any part of the text, as
-- LIKE '%…%' does, but through an FTS5 trigram index instead of a scan of every filing.
-- External content: the index holds no copy of the text; triggers keep it in step with `filings`.
CREATE VIRTUAL TABLE `filings_search` USING fts5(address_line, city, permit_number, rater_name, content='filings', content_rowid='id', tokenize='trigram');
--> statement-breakpoint
INSERT INTO `filings_search` (rowid, address_line, city, permit_number, rater_name) SELECT id, address_line, city, permit_number, rater_name FROM `filings`;
--> statement-breakpoint
CREATE TRIGGER `filings_search_insert` AFTER INSERT ON `filings` BEGIN
  INSERT INTO `filings_search` (rowid, address_line, city, permit_number, rater_name) VALUES (new.id, new.address_line, new.city, new.permit_number, new.rater_name);
END;
--> statement-breakpoint
CREATE TRIGGER `filings_search_delete` AFTER DELETE ON `filings` BEGIN
  INSERT INTO `filings_search` (`filings_search`, rowid, address_line, city, permit_number, rater_name) VALUES ('delete', old.id, old.address_line, old.city, old.permit_number, old.rater_name);
END;
--> statement-breakpoint
CREATE TRIGGER `filings_search_update` AFTER UPDATE OF address_line, city, permit_number, rater_name ON `filings` BEGIN
  INSERT INTO `filings_search` (`filings_search`, rowid, address_line, city, permit_number, rater_name) VALUES ('delete', old.id, old.address_line, old.city, old.permit_number, old.rater_name);
  INSERT INTO `filings_search` (rowid, address_line, city, permit_number, rater_name) VALUES (new.id, new.address_line, new.city, new.permit_number, new.rater_name);
END;
