package main

import (
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"lanecert/reports"
)

// demoFiles is the embedded, invented demo scenario.
//
//go:embed demo/lanes.csv demo/nodes.csv demo/candidates.csv demo/README.txt
var demoFiles embed.FS

type demoOptions struct {
	audit auditOptions
	write string
}

func newDemoCmd(s streams, runF func(*demoOptions) error) *cobra.Command {
	o := &demoOptions{}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Audit the built-in invented scenario (or write its files with --write DIR)",
		Long: `Audit the built-in demo: Quillfern Provisions, an invented company with three
plants, three warehouses, a cross-dock and eight customers on 35 lanes. Its
plan is feasible but not optimal, so the report shows the lanes that break
optimality and the reroute that saves money.

With --write DIR the demo's files are written to DIR as a starting point for
your own data (existing files are never overwritten).

` + exitHelp,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if runF != nil {
				return runF(o)
			}
			return runDemo(o, s)
		},
	}
	addOutputFlags(cmd, &o.audit)
	cmd.Flags().StringVar(&o.write, "write", "", "write the demo files to this directory instead of auditing them")
	return cmd
}

func runDemo(o *demoOptions, s streams) error {
	if o.write != "" {
		return writeDemo(o.write, s)
	}
	dir, err := os.MkdirTemp("", "lanecert-demo-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)
	if err := copyDemo(dir); err != nil {
		return err
	}
	o.audit.files.Network = filepath.Join(dir, "lanes.csv")
	o.audit.files.Nodes = filepath.Join(dir, "nodes.csv")
	// Reports name the embedded files, not the temporary directory.
	o.audit.shownAs = &reports.Inputs{Network: "demo/lanes.csv", Nodes: "demo/nodes.csv", Plan: "demo/lanes.csv (flow column)"}
	return runAudit(&o.audit, s)
}

func copyDemo(dir string) error {
	return fs.WalkDir(demoFiles, "demo", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := demoFiles.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(filepath.Join(dir, filepath.Base(p)), data, 0o644)
	})
}

func writeDemo(dir string, s streams) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	entries, err := fs.ReadDir(demoFiles, "demo")
	if err != nil {
		return err
	}
	for _, e := range entries {
		if _, err := os.Stat(filepath.Join(dir, e.Name())); err == nil {
			return fmt.Errorf("%s already exists: lanecert never overwrites files; choose an empty directory", filepath.Join(dir, e.Name()))
		} else if !errors.Is(err, fs.ErrNotExist) {
			return err
		}
	}
	for _, e := range entries {
		data, err := demoFiles.ReadFile("demo/" + e.Name())
		if err != nil {
			return err
		}
		f, err := os.OpenFile(filepath.Join(dir, e.Name()), os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err != nil {
			return err
		}
		if _, err := f.Write(data); err != nil {
			f.Close()
			return err
		}
		if err := f.Close(); err != nil {
			return err
		}
		fmt.Fprintf(s.out, "wrote %s\n", filepath.Join(dir, e.Name()))
	}
	fmt.Fprintf(s.out, "audit them with: lanecert audit %s --nodes %s\n",
		filepath.Join(dir, "lanes.csv"), filepath.Join(dir, "nodes.csv"))
	return nil
}
