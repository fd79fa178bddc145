DROP TABLE schedule_revisions;
