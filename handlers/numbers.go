package handlers

import (
	"errors"
	"math"
	"strconv"
)

// Numbers from paths, queries and forms are read in their one canonical decimal form:
// "7", never "07", "+7" or " 7", so one resource has one address (and caches, logs and
// links agree on it). Ids are PostgreSQL bigints; versions and revision numbers are
// PostgreSQL integers, so anything above 2^31−1 is refused here rather than by the
// database (whose refusal would be a 500).

var errNotNumber = errors.New("not a positive whole number in canonical form")

// maxVersion is the largest version or revision number a column can hold.
const maxVersion = math.MaxInt32

// canonical reports whether s is a positive decimal with no sign, spaces or leading
// zeros, of at most maxDigits digits.
func canonical(s string, maxDigits int) bool {
	if s == "" || len(s) > maxDigits || s[0] == '0' {
		return false
	}
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return true
}

// parseID reads a positive id from a path.
func parseID(s string) (int64, error) {
	if !canonical(s, 19) {
		return 0, errNotNumber
	}
	return strconv.ParseInt(s, 10, 64)
}

// parseVersion reads a version or revision number (1 … maxVersion).
func parseVersion(s string) (int, error) {
	if !canonical(s, 10) {
		return 0, errNotNumber
	}
	n, err := strconv.ParseInt(s, 10, 64)
	if err != nil || n > maxVersion {
		return 0, errNotNumber
	}
	return int(n), nil
}

// versionProblem checks a version given in JSON; "" when it is acceptable.
func versionProblem(v *int) string {
	switch {
	case v == nil:
		return "is required: send the version you read"
	case *v < 1 || *v > maxVersion:
		return "must be the version you read (a whole number from 1 to 2147483647)"
	}
	return ""
}
