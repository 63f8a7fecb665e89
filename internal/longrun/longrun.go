// Package longrun lets the seeded random tests run longer than the default
// test run, to look for failures the fixed seeds never meet.
//
// LANECERT_LONGRUN=K multiplies the number of random cases of each test
// that uses the package by K (1 to 1000), and LANECERT_LONGRUN_SEED=S (an
// unsigned 64-bit integer) mixes S into each of its seeds, so that runs
// with different S see different networks. Unset, both leave the tests as
// they are: the default run, and CI's, are unchanged. A malformed value
// fails the test rather than running the default silently. While either is
// set, each test logs them (go test prints the log of a failing test), so
// a failure can be replayed with the same environment and case number.
//
// For example:
//
//	LANECERT_LONGRUN=10 LANECERT_LONGRUN_SEED=1 go test -timeout 3h ./...
package longrun

import (
	"os"
	"strconv"
	"testing"
)

// Environment variables read by the package.
const (
	CasesVar = "LANECERT_LONGRUN"
	SeedVar  = "LANECERT_LONGRUN_SEED"
)

// maxFactor bounds LANECERT_LONGRUN.
const maxFactor = 1000

// Cases returns n times the factor of LANECERT_LONGRUN (n when unset). It
// fails tb when the value is not an integer from 1 to 1000, or when the
// product overflows int.
func Cases(tb testing.TB, n int) int {
	tb.Helper()
	v, ok := os.LookupEnv(CasesVar)
	if !ok || v == "" {
		return n
	}
	k, err := strconv.Atoi(v)
	if err != nil || k < 1 || k > maxFactor {
		tb.Fatalf("%s=%q: want an integer from 1 to %d", CasesVar, v, maxFactor)
	}
	logEnv(tb)
	return n * k
}

// Seed returns base when LANECERT_LONGRUN_SEED is unset, otherwise base
// mixed with its value (a bijection of base for each value, so distinct
// seeds of one test stay distinct). It fails tb when the value is not an
// unsigned 64-bit integer.
func Seed(tb testing.TB, base uint64) uint64 {
	tb.Helper()
	v, ok := os.LookupEnv(SeedVar)
	if !ok || v == "" {
		return base
	}
	s, err := strconv.ParseUint(v, 10, 64)
	if err != nil {
		tb.Fatalf("%s=%q: want an unsigned 64-bit integer", SeedVar, v)
	}
	logEnv(tb)
	if s == 0 {
		return base
	}
	return base ^ mix(s)
}

// mix is the SplitMix64 finaliser (Steele, Lea and Flood, "Fast splittable
// pseudorandom number generators", OOPSLA 2014), a bijection: nearby
// values of S give unrelated shifts.
func mix(z uint64) uint64 {
	z += 0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// logEnv logs the environment of a long run (go test prints the log of a
// failing test).
func logEnv(tb testing.TB) {
	tb.Helper()
	tb.Logf("long run: %s=%q %s=%q", CasesVar, os.Getenv(CasesVar), SeedVar, os.Getenv(SeedVar))
}
