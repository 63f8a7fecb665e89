package reports

import (
	"encoding/json"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"lanecert/flow"
)

// PlanFormat is a format for writing a plan.
type PlanFormat string

// The plan formats.
const (
	PlanCSV    PlanFormat = "csv"    // the lane table with a flow column
	PlanDIMACS PlanFormat = "dimacs" // DIMACS s and f lines
	PlanJSON   PlanFormat = "json"
	PlanGrid   PlanFormat = "grid" // a tableau grid, for networks read from one
)

// PlanFormatFor picks the plan format: the one named (csv, dimacs, json),
// else the one the output file's extension implies (.csv; .flow, .sol;
// .json), else CSV.
func PlanFormatFor(name, output string) (PlanFormat, error) {
	switch strings.ToLower(name) {
	case "csv":
		return PlanCSV, nil
	case "dimacs", "flow":
		return PlanDIMACS, nil
	case "json":
		return PlanJSON, nil
	case "grid":
		return PlanGrid, nil
	case "":
	default:
		return "", fmt.Errorf("reports: unknown plan format %q: want csv, dimacs, json or grid", name)
	}
	switch strings.ToLower(filepath.Ext(output)) {
	case ".flow", ".sol":
		return PlanDIMACS, nil
	case ".json":
		return PlanJSON, nil
	}
	return PlanCSV, nil
}

// PlanSchema names the version of the JSON plan document.
const PlanSchema = "lanecert.plan/1"

type planDoc struct {
	Schema  string        `json:"schema"`
	Cost    string        `json:"cost"`
	Lanes   []planLaneDoc `json:"lanes"`
	Caution string        `json:"caution"`
}

type planLaneDoc struct {
	ID   string `json:"id"`
	From string `json:"from"`
	To   string `json:"to"`
	Flow string `json:"flow"`
}

// WritePlan writes plan x of network n with its cost in format f.
func WritePlan(w io.Writer, n *flow.Network, x []int64, cost flow.Wide, f PlanFormat) error {
	switch f {
	case PlanGrid:
		return flow.WriteGridPlan(w, n, x)
	case PlanDIMACS:
		return flow.WriteDIMACSPlan(w, n, x, cost)
	case PlanJSON:
		d := planDoc{Schema: PlanSchema, Cost: n.FormatCost(cost), Lanes: make([]planLaneDoc, n.NumLanes()), Caution: Caution}
		for a := range d.Lanes {
			d.Lanes[a] = planLaneDoc{ID: n.LaneName(flow.LaneID(a)), From: n.Nodes[n.Tail[a]], To: n.Nodes[n.Head[a]], Flow: n.FormatQty(x[a])}
		}
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(d)
	}
	return flow.WriteLaneCSV(w, n, x)
}
