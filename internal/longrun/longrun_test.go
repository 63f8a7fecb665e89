package longrun

import (
	"fmt"
	"testing"
)

// recorder is a testing.TB whose Fatalf records instead of stopping.
type recorder struct {
	testing.TB
	fatal string
	logs  int
}

func (r *recorder) Helper() {}
func (r *recorder) Fatalf(format string, args ...any) {
	if r.fatal == "" {
		r.fatal = fmt.Sprintf(format, args...)
	}
}
func (r *recorder) Logf(string, ...any) { r.logs++ }

func TestCases(t *testing.T) {
	for _, c := range []struct {
		env   string
		set   bool
		n     int
		want  int
		fatal bool
	}{
		{set: false, n: 600, want: 600},
		{env: "", set: true, n: 600, want: 600},
		{env: "1", set: true, n: 600, want: 600},
		{env: "10", set: true, n: 600, want: 6000},
		{env: "1000", set: true, n: 3, want: 3000},
		{env: "0", set: true, n: 600, fatal: true},
		{env: "1001", set: true, n: 600, fatal: true},
		{env: "-2", set: true, n: 600, fatal: true},
		{env: "ten", set: true, n: 600, fatal: true},
		{env: "2.5", set: true, n: 600, fatal: true},
	} {
		t.Run(fmt.Sprintf("%q,%v", c.env, c.set), func(t *testing.T) {
			if c.set {
				t.Setenv(CasesVar, c.env)
			} else {
				t.Setenv(CasesVar, "")
			}
			r := &recorder{TB: t}
			got := Cases(r, c.n)
			if c.fatal {
				if r.fatal == "" {
					t.Fatalf("Cases with %s=%q: no failure", CasesVar, c.env)
				}
				return
			}
			if r.fatal != "" || got != c.want {
				t.Fatalf("Cases(%d) with %s=%q: %d (failure %q), want %d", c.n, CasesVar, c.env, got, r.fatal, c.want)
			}
			if wantLogs := map[bool]int{true: 1, false: 0}[c.env != ""]; r.logs != wantLogs {
				t.Fatalf("%d log lines, want %d", r.logs, wantLogs)
			}
		})
	}
}

func TestSeed(t *testing.T) {
	t.Setenv(SeedVar, "")
	if got := Seed(t, 20240601); got != 20240601 {
		t.Fatalf("unset: %d", got)
	}
	t.Setenv(SeedVar, "0")
	if got := Seed(t, 20240601); got != 20240601 {
		t.Fatalf("0: %d", got)
	}
	// Different values move a seed to different places, and distinct
	// seeds stay distinct under one value.
	seen := map[uint64]string{}
	for _, s := range []string{"1", "2", "3", "18446744073709551615"} {
		t.Setenv(SeedVar, s)
		for _, base := range []uint64{0, 1, 7, 20240601} {
			got := Seed(t, base)
			if prev, ok := seen[got]; ok {
				t.Fatalf("%s=%s, base %d: seed %d already given by %s", SeedVar, s, base, got, prev)
			}
			seen[got] = fmt.Sprintf("%s=%s, base %d", SeedVar, s, base)
		}
	}
	for _, bad := range []string{"-1", "x", "18446744073709551616"} {
		t.Setenv(SeedVar, bad)
		r := &recorder{TB: t}
		if Seed(r, 5); r.fatal == "" {
			t.Fatalf("%s=%q: no failure", SeedVar, bad)
		}
	}
}

// TestMix checks the finaliser against the first output of the SplitMix64
// generator from state 0, 0xe220a8397b1dcdaf (Vigna's reference
// splitmix64.c: the first call adds the increment to the state, then
// mixes; value from memory).
func TestMix(t *testing.T) {
	if got := mix(0); got != 0xe220a8397b1dcdaf {
		t.Fatalf("mix(0) = %#x, want 0xe220a8397b1dcdaf", got)
	}
}
