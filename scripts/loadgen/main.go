package main

import (
	"context"
	"flag"
	"fmt"
	"os"
	"os/signal"
	"strings"
)

func main() {
	var opt Options
	flag.StringVar(&opt.Target, "url", "http://127.0.0.1:8080", "base URL of the app (loopback only)")
	also := flag.String("also", "", "more instances of the app on the same database, comma-separated URLs: load spread over all")
	flag.Int64Var(&opt.ProjectID, "project", 0, "project to load (0: seed a new one)")
	flag.IntVar(&opt.Lines, "lines", 500, "lines to seed")
	flag.IntVar(&opt.Clients, "clients", 64, "concurrent clients")
	flag.IntVar(&opt.Requests, "requests", 100000, "at most this many requests per scenario")
	flag.DurationVar(&opt.Duration, "duration", 0, "at most this long per scenario (default 10s)")
	flag.Parse()
	if *also != "" {
		opt.Also = strings.Split(*also, ",")
	}
	opt.User, opt.Password = os.Getenv("LOADGEN_USER"), os.Getenv("LOADGEN_PASSWORD")
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	res, err := Run(ctx, opt, os.Stdout)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	if len(res) == 3 && res[1].RPS() > 0 {
		fmt.Printf("page rate / static rate = %.0f %% (target ≥ 25 %%)\n", 100*res[0].RPS()/res[1].RPS())
	}
	for _, r := range res {
		if r.Errors > 0 {
			os.Exit(1)
		}
	}
}
