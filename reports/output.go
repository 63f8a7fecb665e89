package reports

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// WriteAtomic writes the output of fn to path through a temporary file in
// the same directory and a rename, so readers never see a half-written file.
// It refuses to write over any of the inputs.
func WriteAtomic(path string, inputs []string, fn func(io.Writer) error) error {
	if err := notAnInput(path, inputs); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return fmt.Errorf("reports: %w", err)
	}
	defer os.Remove(tmp.Name()) // no-op after a successful rename
	bw := bufio.NewWriter(tmp)
	if err := fn(bw); err != nil {
		tmp.Close()
		return err
	}
	if err := bw.Flush(); err != nil {
		tmp.Close()
		return fmt.Errorf("reports: writing %s: %w", path, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("reports: writing %s: %w", path, err)
	}
	if err := os.Chmod(tmp.Name(), 0o644); err != nil {
		return fmt.Errorf("reports: %w", err)
	}
	if err := os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("reports: %w", err)
	}
	return nil
}

func notAnInput(path string, inputs []string) error {
	abs, err := filepath.Abs(path)
	if err != nil {
		return fmt.Errorf("reports: %w", err)
	}
	out, statErr := os.Stat(path)
	for _, in := range inputs {
		if in == "" {
			continue
		}
		ia, err := filepath.Abs(in)
		if err != nil {
			continue
		}
		same := ia == abs
		if !same && statErr == nil {
			if st, err := os.Stat(in); err == nil && os.SameFile(st, out) {
				same = true
			}
		}
		if same {
			return fmt.Errorf("reports: refusing to write %s: it is an input file", path)
		}
	}
	return nil
}
