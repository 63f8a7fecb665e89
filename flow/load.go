package flow

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// Files names the input files of a network and a plan.
type Files struct {
	// Network is a lane table (CSV), a DIMACS .min file, a workbook
	// (.xlsx, read by ReadXLSX) or a tableau grid (CSV, read by ReadGrid).
	Network string
	// Nodes is a node table (CSV); only with a lane table.
	Nodes string
	// Plan is a plan file: a CSV keyed by lane or by from,to, or DIMACS
	// solution lines. Empty: the lane table's flow column, if any.
	Plan string
	// Table controls the CSV readers.
	Table TableOptions
	// Grid reads Network as a tableau grid (ReadGrid) and Plan, unless it
	// is DIMACS, as a plan grid (ReadGridPlan). Without it, a CSV network
	// whose first line ends in a "supply" cell and has no from, to or node
	// column is read as a grid all the same, and then a CSV plan without a
	// flow column is read as a plan grid.
	Grid bool
	// LaneSheet and NodeSheet choose the worksheets of an .xlsx network
	// (see XLSXOptions; empty: "lanes" and "nodes").
	LaneSheet, NodeSheet string
	// Tolerance, if not nil, lets plan quantities from a floating-point
	// solver be rounded to the network's places (see RawPlan.Bind).
	Tolerance *Decimal
}

// Loaded is what LoadFiles read.
type Loaded struct {
	Net *Network
	// Plan is nil when no plan was given and the lane table has no flow
	// column.
	Plan *Plan
	// PlanFile names where the plan came from.
	PlanFile string
}

// LoadFiles reads the files named by f, telling DIMACS from CSV by the file
// name's extension (.min, .dimacs, .net / .flow, .sol) or else by content,
// a workbook by the extension .xlsx, and a tableau grid by f.Grid or by its
// first line (see Files.Grid).
func LoadFiles(f Files) (*Loaded, error) {
	data, err := os.ReadFile(f.Network)
	if err != nil {
		return nil, fmt.Errorf("flow: %w", err)
	}
	out := &Loaded{}
	var raw *RawPlan
	isXLSX := strings.EqualFold(filepath.Ext(f.Network), ".xlsx")
	switch {
	case isXLSX || f.Grid || (!isDIMACS(f.Network, data) && isGridText(data)):
		if f.Nodes != "" {
			return nil, fmt.Errorf("flow: %s is a workbook or a tableau grid: its supplies and demands are inside it, a node table does not apply", f.Network)
		}
		if isXLSX {
			out.Net, raw, err = ReadXLSX(bytes.NewReader(data), f.Network, XLSXOptions{Table: f.Table, LaneSheet: f.LaneSheet, NodeSheet: f.NodeSheet})
			if raw != nil {
				out.PlanFile = f.Network + " (flow column)"
			}
		} else {
			out.Net, err = ReadGrid(bytes.NewReader(data), f.Network, f.Table)
		}
		if err != nil {
			return nil, err
		}
	case isDIMACS(f.Network, data):
		if f.Nodes != "" {
			return nil, fmt.Errorf("flow: %s is a DIMACS file: its nodes come from its n lines, a node table does not apply", f.Network)
		}
		if out.Net, err = parseDIMACS(data, f.Network); err != nil {
			return nil, err
		}
	default:
		var nr io.Reader // stays a nil interface without a node table
		if f.Nodes != "" {
			nd, err := os.ReadFile(f.Nodes)
			if err != nil {
				return nil, fmt.Errorf("flow: %w", err)
			}
			nr = bytes.NewReader(nd)
		}
		if out.Net, raw, err = readCSVNetwork(data, f.Network, nr, f.Nodes, f.Table); err != nil {
			return nil, err
		}
		if raw != nil {
			out.PlanFile = f.Network + " (flow column)"
		}
	}
	if f.Plan != "" {
		pd, err := os.ReadFile(f.Plan)
		if err != nil {
			return nil, fmt.Errorf("flow: %w", err)
		}
		switch {
		case isDIMACSPlan(f.Plan, pd):
			raw, err = ReadDIMACSPlan(bytes.NewReader(pd), f.Plan, out.Net)
		case out.Net.Grid != nil && (f.Grid || !isPlanTable(pd, f.Table)):
			raw, err = ReadGridPlan(bytes.NewReader(pd), f.Plan, out.Net, f.Table)
		default:
			raw, err = ReadCSVPlan(bytes.NewReader(pd), f.Plan, out.Net, f.Table)
		}
		if err != nil {
			return nil, err
		}
		out.PlanFile = f.Plan
	}
	if raw != nil {
		if out.Plan, err = raw.Bind(out.Net, f.Tolerance); err != nil {
			return nil, err
		}
	}
	return out, nil
}

func firstToken(data []byte) string {
	for len(data) > 0 {
		i := bytes.IndexByte(data, '\n')
		line := data
		if i >= 0 {
			line, data = data[:i], data[i+1:]
		} else {
			data = nil
		}
		if f := bytes.Fields(line); len(f) > 0 {
			return string(f[0])
		}
	}
	return ""
}

func isDIMACS(path string, data []byte) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".min", ".dimacs", ".net":
		return true
	case ".csv", ".tsv", ".txt":
		return false
	}
	t := firstToken(bytes.TrimPrefix(data, []byte("\xef\xbb\xbf")))
	return t == "c" || t == "p"
}

func isDIMACSPlan(path string, data []byte) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".flow", ".sol":
		return true
	case ".csv", ".tsv", ".txt":
		return false
	}
	t := firstToken(bytes.TrimPrefix(data, []byte("\xef\xbb\xbf")))
	return t == "c" || t == "s" || t == "f"
}
