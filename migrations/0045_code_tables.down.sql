DROP TABLE code_tables;
