DROP TABLE login_attempts;
