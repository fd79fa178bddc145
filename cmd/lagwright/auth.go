package main

import (
	"fmt"
	"net"
	"strings"

	"lagwright/handlers"
)

// authConfig reads LAGWRIGHT_AUTH and LAGWRIGHT_SECURE_COOKIES for the listen address:
//
//	auto      (default) login required unless the address is loopback
//	required  login always required
//	off       no login: allowed on a loopback address only
//
// Loopback is 127.0.0.0/8, ::1 or the name localhost; an empty host (":8080") listens
// on every interface and is not loopback.
func authConfig(addr string, getenv func(string) string) (handlers.AuthConfig, error) {
	var ac handlers.AuthConfig
	switch v := strings.TrimSpace(getenv("LAGWRIGHT_SECURE_COOKIES")); v {
	case "", "0", "false":
	case "1", "true":
		ac.SecureCookies = true
	default:
		return ac, usageError{fmt.Sprintf("LAGWRIGHT_SECURE_COOKIES=%q: want 1 or 0", v)}
	}
	loop := isLoopback(addr)
	switch mode := orDefault(strings.TrimSpace(getenv("LAGWRIGHT_AUTH")), "auto"); mode {
	case "auto":
		ac.Required = !loop
	case "required":
		ac.Required = true
	case "off":
		if !loop {
			return ac, usageError{fmt.Sprintf("LAGWRIGHT_AUTH=off is allowed on a loopback address only, not %s", addr)}
		}
	default:
		return ac, usageError{fmt.Sprintf("LAGWRIGHT_AUTH=%q: want auto, required or off", mode)}
	}
	return ac, nil
}

// isLoopback reports whether a listen address only accepts local connections.
func isLoopback(addr string) bool {
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return false
	}
	if strings.EqualFold(host, "localhost") {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}
