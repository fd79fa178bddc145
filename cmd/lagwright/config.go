package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"log/slog"
	"runtime/debug"
	"strings"
	"time"

	"lagwright/store"
)

// config is what the subcommands read from flags and the environment.
type config struct {
	Addr        string
	DatabaseURL string
	DataDir     string
	LogLevel    slog.Level
	// DB holds the statement and acquire timeouts (0: the store's defaults; a
	// statement_timeout in DATABASE_URL's options is kept unless one is set here).
	DB store.Options
}

// parseConfig reads the environment, then flags over it. It returns the
// arguments left after the flags.
func parseConfig(name string, args []string, getenv func(string) string, stderr io.Writer) (config, []string, error) {
	cfg := config{
		Addr:        orDefault(getenv("LAGWRIGHT_ADDR"), "127.0.0.1:8080"),
		DatabaseURL: getenv("DATABASE_URL"),
		DataDir:     orDefault(getenv("LAGWRIGHT_DATA"), "./data"),
	}
	level := orDefault(getenv("LAGWRIGHT_LOG_LEVEL"), "info")
	stmt, acquire := getenv("LAGWRIGHT_STATEMENT_TIMEOUT"), getenv("LAGWRIGHT_ACQUIRE_TIMEOUT")
	fs := flag.NewFlagSet("lagwright "+name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.StringVar(&cfg.Addr, "addr", cfg.Addr, "listen address (LAGWRIGHT_ADDR)")
	fs.StringVar(&cfg.DatabaseURL, "database-url", cfg.DatabaseURL, "PostgreSQL URL (DATABASE_URL); empty: a private cluster in the data folder")
	fs.StringVar(&cfg.DataDir, "data", cfg.DataDir, "data folder (LAGWRIGHT_DATA)")
	fs.StringVar(&level, "log-level", level, "debug, info, warn or error (LAGWRIGHT_LOG_LEVEL)")
	fs.StringVar(&stmt, "statement-timeout", stmt, "longest a database statement may run, e.g. 30s (LAGWRIGHT_STATEMENT_TIMEOUT; default: DATABASE_URL's, else 30s)")
	fs.StringVar(&acquire, "acquire-timeout", acquire, "longest a request waits for a database connection, e.g. 15s (LAGWRIGHT_ACQUIRE_TIMEOUT)")
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return cfg, nil, usageError{"help requested"}
		}
		return cfg, nil, usageError{err.Error()}
	}
	if err := cfg.LogLevel.UnmarshalText([]byte(level)); err != nil {
		return cfg, nil, usageError{fmt.Sprintf("log level %q: want debug, info, warn or error", level)}
	}
	var err error
	if cfg.DB.StatementTimeout, err = timeoutSetting("statement timeout", stmt); err != nil {
		return cfg, nil, err
	}
	if cfg.DB.AcquireTimeout, err = timeoutSetting("acquire timeout", acquire); err != nil {
		return cfg, nil, err
	}
	if strings.TrimSpace(cfg.DataDir) == "" {
		return cfg, nil, usageError{"the data folder must not be empty"}
	}
	return cfg, fs.Args(), nil
}

// timeoutSetting reads a duration such as "30s" or "1m"; "" is 0 (the default).
func timeoutSetting(what, v string) (time.Duration, error) {
	if v == "" {
		return 0, nil
	}
	d, err := time.ParseDuration(v)
	if err != nil || d < 100*time.Millisecond || d > 24*time.Hour {
		return 0, usageError{fmt.Sprintf("%s %q: want a duration from 100ms to 24h, such as 30s or 2m", what, v)}
	}
	return d, nil
}

func orDefault(v, def string) string {
	if v == "" {
		return def
	}
	return v
}

func newLogger(w io.Writer, level slog.Level) *slog.Logger {
	return slog.New(slog.NewTextHandler(w, &slog.HandlerOptions{Level: level}))
}

// version is the module version and VCS revision the binary was built from.
func version() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return "dev"
	}
	v := bi.Main.Version
	if v == "" || v == "(devel)" {
		v = "dev"
	}
	for _, s := range bi.Settings {
		if s.Key == "vcs.revision" && len(s.Value) >= 12 {
			v += "+" + s.Value[:12]
		}
	}
	return v
}
