DROP TABLE sessions;
DROP TABLE users;
