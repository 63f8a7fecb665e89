package reports

import (
	"bytes"
	"fmt"
	"html/template"
	"image/color"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"

	"lanecert/dual"
)

// The charts of the HTML report, drawn with gonum.org/v1/plot and inlined
// as SVG. The values are converted to float64 for drawing only: every
// number a reader relies on is printed exactly in the tables beside them.
//
// Self-contained and deterministic: the canvas does not embed fonts (that
// would add about 400 kB of base64 per chart); its text names the
// Liberation Sans family, which the report widens to a metric-compatible
// fallback list ending in the generic sans-serif, so a browser offline
// shows it with a local font. gonum's SVG writer prints numbers with a
// fixed precision and draws in call order, so two renders of the same
// audit are byte-identical (a test checks this). The XML prologue and the
// generator comment are dropped so the SVG can sit inside HTML.

// chart is one inline chart.
type chart struct {
	ID      string
	Title   string
	Caption string
	SVG     template.HTML
	Note    string // why the chart is absent, when SVG is empty
}

// maxRepairBars is how many repair lanes the saving chart shows.
const maxRepairBars = 20

// histBins is the histogram's number of bins (at most).
const histBins = 20

// okabe turns a colour of the Okabe–Ito palette (see svg.go) into a
// color.Color.
func okabe(hex uint32) color.Color {
	return color.RGBA{R: uint8(hex >> 16), G: uint8(hex >> 8), B: uint8(hex), A: 0xff}
}

// buildCharts draws the three charts. A chart that has no data gets a note
// instead. Time O(|E|) for the histogram, O(r log r) for r repair lanes.
func buildCharts(d *Document) ([]chart, error) {
	var out []chart
	c, err := costChart(d)
	if err != nil {
		return nil, err
	}
	out = append(out, c)
	if c, err = repairChart(d); err != nil {
		return nil, err
	}
	out = append(out, c)
	if c, err = reducedChart(d); err != nil {
		return nil, err
	}
	return append(out, c), nil
}

// num turns an exact decimal string into a float for drawing.
func num(s string) float64 {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0
	}
	return v
}

func costChart(d *Document) (chart, error) {
	c := chart{ID: "chart-cost", Title: "Plan cost and optimal cost"}
	if d.OptimalCost == nil || d.Gap == nil {
		c.Note = "No comparison: the optimal cost is not known for this audit (plan infeasible, network infeasible, unbounded, or not solved)."
		return c, nil
	}
	p := newPlot()
	p.Y.Label.Text = "cost"
	vals := plotter.Values{num(d.PlanCost), num(*d.OptimalCost)}
	bars, err := plotter.NewBarChart(vals, vg.Points(60))
	if err != nil {
		return c, fmt.Errorf("reports: cost chart: %w", err)
	}
	bars.Color = okabe(0x0072B2)
	bars.LineStyle.Width = 0
	p.Add(bars)
	p.NominalX("plan", "optimum")
	// Room for the bars' width at both ends (gonum sizes the x range by
	// the bar centres).
	p.X.Min, p.X.Max = -0.6, 1.6
	pad(&p.Y)
	c.Caption = fmt.Sprintf("Plan cost %s, optimal cost %s, gap %s.", d.PlanCost, *d.OptimalCost, *d.Gap)
	c.SVG, err = renderChart(p, 4*vg.Inch, 3*vg.Inch, c.Title)
	return c, err
}

func repairChart(d *Document) (chart, error) {
	c := chart{ID: "chart-repair", Title: fmt.Sprintf("Saving by lane of the repair (largest first, top %d)", maxRepairBars)}
	if len(d.Repair) == 0 {
		c.Note = "No repair: the optimal plan changes no lane (or the optimum is not known)."
		return c, nil
	}
	type bar struct {
		lane   string
		saving float64
		i      int
	}
	bars := make([]bar, len(d.Repair))
	for i, r := range d.Repair {
		bars[i] = bar{r.Lane, -num(r.CostChange), i}
	}
	sort.SliceStable(bars, func(i, j int) bool { return bars[i].saving > bars[j].saving })
	if len(bars) > maxRepairBars {
		bars = bars[:maxRepairBars]
	}
	// Horizontal bars, the largest at the top (gonum counts from the bottom).
	vals := make(plotter.Values, len(bars))
	names := make([]string, len(bars))
	for i, b := range bars {
		j := len(bars) - 1 - i
		vals[j], names[j] = b.saving, b.lane
	}
	p := newPlot()
	p.X.Label.Text = "saving (cost; negative: the lane costs more)"
	bc, err := plotter.NewBarChart(vals, vg.Points(12))
	if err != nil {
		return c, fmt.Errorf("reports: repair chart: %w", err)
	}
	bc.Horizontal = true
	bc.Color = okabe(0x009E73)
	bc.LineStyle.Width = 0
	p.Add(bc)
	p.NominalY(names...)
	p.Y.Min, p.Y.Max = -0.6, float64(len(bars))-0.4 // room for the bars' height
	pad(&p.X)
	c.Caption = fmt.Sprintf("%d of %d changed lane(s); the repair table lists the exact amounts.", len(bars), len(d.Repair))
	h := vg.Length(len(bars))*16 + 70
	c.SVG, err = renderChart(p, 6*vg.Inch, h, c.Title)
	return c, err
}

func reducedChart(d *Document) (chart, error) {
	c := chart{ID: "chart-reduced", Title: "Reduced costs of unused lanes"}
	a := d.audit
	if a.Reduced == nil {
		c.Note = "No reduced costs: the plan is infeasible, so no potentials were computed."
		return c, nil
	}
	scale := math.Pow10(d.net.RatePlaces)
	var vals plotter.Values
	neg := 0
	for e, s := range a.State {
		if s == dual.Unused {
			vals = append(vals, float64(a.Reduced[e])/scale)
			if a.Reduced[e] < 0 {
				neg++
			}
		}
	}
	if len(vals) == 0 {
		c.Note = "No unused lanes."
		return c, nil
	}
	bins := min(histBins, len(vals))
	lo, hi := vals[0], vals[0]
	for _, v := range vals {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo == hi {
		bins = 1
	}
	h, err := plotter.NewHist(vals, bins)
	if err != nil {
		return c, fmt.Errorf("reports: reduced-cost chart: %w", err)
	}
	if b := &h.Bins[0]; lo == hi && b.Max <= b.Min {
		// A single value so large that gonum's bin of width 1 rounds
		// away: give the bin a width the float64 can hold.
		h.Width = roomAround(lo)
		b.Max = b.Min + h.Width
	}
	h.FillColor = okabe(0x56B4E9)
	h.LineStyle.Width = vg.Points(0.5)
	p := newPlot()
	p.Add(h)
	p.X.Label.Text = "reduced cost (rate units; negative: the lane should be used)"
	p.Y.Label.Text = "unused lanes"
	pad(&p.Y)
	c.Caption = fmt.Sprintf("%d unused lane(s); %d with a negative reduced cost (each breaks optimality).", len(vals), neg)
	c.SVG, err = renderChart(p, 6*vg.Inch, 3*vg.Inch, c.Title)
	return c, err
}

// roomAround returns a width that float64 arithmetic keeps when added to
// v: 1, or a millionth of |v| when that is more.
func roomAround(v float64) float64 {
	return math.Max(1, math.Abs(v)*1e-6)
}

// pad widens an axis to include 0 and leaves 5% room beyond the data.
func pad(ax *plot.Axis) {
	lo, hi := math.Min(0, ax.Min), math.Max(0, ax.Max)
	span := hi - lo
	if span == 0 {
		span = 1
	}
	if lo < 0 {
		lo -= 0.05 * span
	}
	if hi > 0 || lo == 0 {
		hi += 0.05 * span
	}
	ax.Min, ax.Max = lo, hi
}

// newPlot returns a plot with a white background, a grid, and the
// Liberation Sans face for every text (set per plot: gonum's package-level
// default font is left alone).
func newPlot() *plot.Plot {
	p := plot.New()
	p.BackgroundColor = color.White
	p.Add(plotter.NewGrid())
	sans := func(size vg.Length) font.Font {
		return font.Font{Typeface: "Liberation", Variant: "Sans", Size: size}
	}
	p.Title.TextStyle.Font = sans(12)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = sans(11)
		ax.Tick.Label.Font = sans(10)
	}
	return p
}

// renderChart draws p to an SVG string fit for inlining in HTML: without
// the XML prologue and comment, sized by its viewBox, with a font fallback.
func renderChart(p *plot.Plot, w, h vg.Length, label string) (template.HTML, error) {
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		if ax.Max <= ax.Min { // gonum's ticks need a range
			ax.Max = ax.Min + roomAround(ax.Min)
		}
	}
	cv := vgsvg.NewWith(vgsvg.UseWH(w, h), vgsvg.EmbedFonts(false))
	p.Draw(draw.New(cv))
	var buf bytes.Buffer
	if _, err := cv.WriteTo(&buf); err != nil {
		return "", fmt.Errorf("reports: chart: %w", err)
	}
	s := buf.String()
	i := strings.Index(s, "<svg")
	if i < 0 {
		return "", fmt.Errorf("reports: chart: no svg element in gonum output")
	}
	s = s[i:]
	// Size by the viewBox only, so the page can scale the chart.
	if j := strings.Index(s, "viewBox="); j > 0 {
		s = `<svg class="chart-svg" role="img" aria-label="` + esc(label) + `" ` + s[j:]
	}
	s = strings.ReplaceAll(s, "font-family:Liberation Sans;", "font-family:Liberation Sans,Arial,Helvetica,sans-serif;")
	return template.HTML(s), nil
}
