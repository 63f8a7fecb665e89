package reports_test

import (
	"bytes"
	"cmp"
	"context"
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/big"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/fetch"
	"github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"lanecert/reports"
)

// The browser test opens the generated HTML reports in headless Chromium
// and checks what a reader sees and can do: the verdict, the drawing, the
// sortable lane table and the problem filter. It also checks that a page
// logs no error, throws no exception and fetches nothing.
//
// Environment:
//
//	LANECERT_CHROMIUM       path of the browser (default /usr/bin/chromium,
//	                        else "chromium" on PATH)
//	LANECERT_BROWSER_TESTS  "1": a missing browser fails the test (CI);
//	                        otherwise the test skips without a browser
//	LANECERT_ARTIFACTS      directory for the screenshots (default: a
//	                        temporary directory, removed after the test)

const (
	browserTotal   = 55 * time.Second // the whole test, browser start included
	browserPerPage = 20 * time.Second // one page: load, checks, screenshot
	browserWidth   = 1200             // CSS pixels; the page is at most 1100 wide
	browserHeight  = 900
)

// browserPath returns the browser to run, or skips or fails the test when
// there is none.
func browserPath(t *testing.T) string {
	t.Helper()
	path := os.Getenv("LANECERT_CHROMIUM")
	if path == "" {
		path = "/usr/bin/chromium"
		// .ci/run installs the browser when "chromium" is not on PATH, so
		// one on PATH elsewhere counts too.
		if _, err := os.Stat(path); err != nil {
			if p, err := exec.LookPath("chromium"); err == nil {
				path = p
			}
		}
	}
	if fi, err := os.Stat(path); err != nil || fi.IsDir() || fi.Mode()&0o111 == 0 {
		if os.Getenv("LANECERT_BROWSER_TESTS") == "1" {
			t.Fatalf("LANECERT_BROWSER_TESTS=1 but no browser at %s (set LANECERT_CHROMIUM, or install the chromium package)", path)
		}
		t.Skipf("no browser at %s: install the chromium package or set LANECERT_CHROMIUM (LANECERT_BROWSER_TESTS=1 makes this a failure)", path)
	}
	return path
}

// artifactDir is where screenshots go: $LANECERT_ARTIFACTS, else a
// temporary directory.
func artifactDir(t *testing.T) string {
	t.Helper()
	dir := os.Getenv("LANECERT_ARTIFACTS")
	if dir == "" {
		return t.TempDir()
	}
	dir, err := filepath.Abs(dir)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	return dir
}

// startBrowser starts headless Chromium with a fresh profile and returns a
// context whose tabs share it. The browser stops when the test ends.
func startBrowser(t *testing.T, exe string) context.Context {
	t.Helper()
	profile := t.TempDir()
	ctx, cancel := context.WithTimeout(context.Background(), browserTotal)
	// Only these flags (NewExecAllocator, not the package's default list).
	// The allocator adds --remote-debugging-pipe and the first page,
	// about:blank, itself.
	actx, cancelAlloc := chromedp.NewExecAllocator(ctx,
		chromedp.ExecPath(exe),
		chromedp.UserDataDir(profile),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("disable-gpu", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-quic", true),
	)
	bctx, cancelBrowser := chromedp.NewContext(actx)
	// Cleanups run last in, first out: the browser closes and the allocator
	// waits for its process before the profile directory is removed.
	t.Cleanup(cancel)
	t.Cleanup(cancelAlloc)
	t.Cleanup(cancelBrowser)
	if err := chromedp.Do(bctx); err != nil {
		t.Fatalf("starting %s: %v", exe, err)
	}
	return bctx
}

// pageWatch records what a tab did besides showing the page: errors in its
// console (console.error and console.assert calls, uncaught exceptions, and
// browser log entries of level error, which is where Content-Security-Policy
// violations and failed loads appear) and every request for any URL other
// than the page itself. data: URLs are not requests to anywhere and are not
// recorded.
type pageWatch struct {
	page string // the page's own URL

	mu       sync.Mutex
	errs     []string
	requests []string
}

func (w *pageWatch) add(list *[]string, s string) {
	w.mu.Lock()
	defer w.mu.Unlock()
	*list = append(*list, s)
}

func (w *pageWatch) foreign(u string) bool {
	return u != w.page && !strings.HasPrefix(u, "data:")
}

// event is called on the tab's reading goroutine: it must only record.
func (w *pageWatch) event(ev any) {
	switch ev := ev.(type) {
	case *runtime.EventConsoleAPICalled:
		if ev.Type == runtime.ConsoleAPICalledTypeError || ev.Type == runtime.ConsoleAPICalledTypeAssert {
			var parts []string
			for _, a := range ev.Args {
				switch {
				case len(a.Value) > 0:
					parts = append(parts, string(a.Value))
				case a.Description != "":
					parts = append(parts, a.Description)
				}
			}
			w.add(&w.errs, fmt.Sprintf("console.%s: %s", ev.Type, strings.Join(parts, " ")))
		}
	case *runtime.EventExceptionThrown:
		d := ev.ExceptionDetails
		msg := d.Text
		if d.Exception != nil && d.Exception.Description != "" {
			msg += " " + d.Exception.Description
		}
		w.add(&w.errs, fmt.Sprintf("exception at %d:%d: %s", d.LineNumber+1, d.ColumnNumber+1, msg))
	case *log.EventEntryAdded:
		if e := ev.Entry; e.Level == log.EntryLevelError {
			w.add(&w.errs, fmt.Sprintf("log (%s): %s", e.Source, e.Text))
		}
	case *network.EventRequestWillBeSent:
		if ev.Request != nil && w.foreign(ev.Request.URL) {
			w.add(&w.requests, ev.Request.URL)
		}
	}
}

func (w *pageWatch) snapshot() (errs, requests []string) {
	w.mu.Lock()
	defer w.mu.Unlock()
	return slices.Clone(w.errs), slices.Clone(w.requests)
}

// openTab opens url in a new tab of the browser with every request but the
// page's own blocked (the Fetch domain pauses each request; the page is let
// through, anything else fails as blocked by the client and is recorded).
// The tab closes when the returned cancel func is called.
func openTab(t *testing.T, browser context.Context, pageURL string) (context.Context, *pageWatch, func()) {
	t.Helper()
	pctx, cancelTime := context.WithTimeout(browser, browserPerPage)
	ctx, cancelTab := chromedp.NewContext(pctx)
	w := &pageWatch{page: pageURL}
	if err := chromedp.Listen(ctx, w.event); err != nil {
		cancelTab()
		cancelTime()
		t.Fatal(err)
	}
	paused := chromedp.Events(ctx, fetch.RequestPaused)
	done := make(chan struct{})
	go func() {
		defer close(done)
		for ev, err := range paused {
			if err != nil {
				return
			}
			id := ev.RequestID
			var u string
			if ev.Request != nil {
				u = ev.Request.URL
			}
			if !w.foreign(u) {
				chromedp.Do(ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
					_, err := cdp.Call(ctx, tg, fetch.ContinueRequest, fetch.ContinueRequestParams{RequestID: id})
					return err
				}))
				continue
			}
			w.add(&w.requests, u)
			chromedp.Do(ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
				_, err := cdp.Call(ctx, tg, fetch.FailRequest, fetch.FailRequestParams{RequestID: id, ErrorReason: network.ErrorReasonBlockedByClient})
				return err
			}))
		}
	}()
	closeTab := func() {
		cancelTab()
		cancelTime()
		<-done
	}
	err := chromedp.Do(ctx,
		chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			if _, err := cdp.Call(ctx, tg, fetch.Enable, fetch.EnableParams{Patterns: []*fetch.RequestPattern{{URLPattern: "*"}}}); err != nil {
				return err
			}
			_, err := cdp.Call(ctx, tg, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{
				Width: browserWidth, Height: browserHeight, DeviceScaleFactor: 1})
			return err
		}),
		chromedp.Navigate(pageURL),
	)
	if err != nil {
		closeTab()
		t.Fatalf("opening %s: %v", pageURL, err)
	}
	return ctx, w, closeTab
}

// fileURL is the file: URL of an absolute path.
func fileURL(path string) string {
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(path)}).String()
}

// screenshot saves a PNG of the whole page (not only the viewport) as
// dir/name.png and returns its path.
func screenshot(ctx context.Context, dir, name string) (string, error) {
	png, err := chromedp.Run(ctx, func(ctx context.Context, tg *chromedp.Target) ([]byte, error) {
		m, err := cdp.Call(ctx, tg, page.GetLayoutMetrics, cdp.Empty{})
		if err != nil {
			return nil, err
		}
		if m.CSSContentSize == nil {
			return nil, errors.New("no content size")
		}
		r, err := cdp.Call(ctx, tg, page.CaptureScreenshot, page.CaptureScreenshotParams{
			Format:                page.CaptureScreenshotFormatPng,
			CaptureBeyondViewport: new(true),
			FromSurface:           new(true),
			Clip: &page.Viewport{Width: math.Ceil(m.CSSContentSize.Width),
				Height: math.Ceil(m.CSSContentSize.Height), Scale: 1},
		})
		return r.Data, err
	})
	if err != nil {
		return "", err
	}
	if !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) {
		return "", fmt.Errorf("screenshot of %s is not a PNG", name)
	}
	path := filepath.Join(dir, name+".png")
	return path, os.WriteFile(path, png, 0o644)
}

// pageFacts is what the page shows, read from its DOM.
type pageFacts struct {
	VerdictClasses []string `json:"verdictClasses"`
	VerdictLine    string   `json:"verdictLine"`
	DrawnLanes     int      `json:"drawnLanes"`
	SVGLanes       string   `json:"svgLanes"`
	DrawnNodes     int      `json:"drawnNodes"`
	SVGNodes       string   `json:"svgNodes"`
	Caution        bool     `json:"caution"`
	CautionText    string   `json:"cautionText"`
	Heads          []struct {
		Name   string `json:"name"`
		Sort   string `json:"sort"`
		Button bool   `json:"button"`
	} `json:"heads"`
	Rows int `json:"rows"`
}

const factsJS = `(() => {
  const q = (s) => document.querySelector(s);
  const svg = q("#network-drawing");
  const v = q("#verdict");
  const lt = q("#lane-table");
  return {
    verdictClasses: v ? Array.from(v.classList) : [],
    verdictLine: v ? v.querySelector(".verdict-line").textContent.trim() : "",
    drawnLanes: document.querySelectorAll("#network-drawing [data-lane]").length,
    svgLanes: svg ? svg.getAttribute("data-lanes") : "",
    drawnNodes: document.querySelectorAll("#network-drawing [data-node]").length,
    svgNodes: svg ? svg.getAttribute("data-nodes") : "",
    caution: q("#caution") !== null,
    cautionText: q("#caution") ? q("#caution").textContent.trim() : "",
    heads: lt ? Array.from(lt.tHead.rows[0].cells).map((th) => ({
      name: th.textContent.trim(), sort: th.getAttribute("data-sort") || "", button: th.querySelector("button") !== null})) : [],
    rows: lt ? lt.tBodies[0].rows.length : 0,
  };
})()`

// laneRow is one row of the lane table as shown, in DOM order.
type laneRow struct {
	Order   int    `json:"order"`
	Cell    string `json:"cell"`
	Problem bool   `json:"problem"`
	Visible bool   `json:"visible"`
}

// tableState is the lane table's rows and sort marks.
type tableState struct {
	AriaSort []string  `json:"ariaSort"`
	Filtered bool      `json:"filtered"`
	Rows     []laneRow `json:"rows"`
}

func tableJS(col int) string {
	return fmt.Sprintf(`(() => {
  const lt = document.getElementById("lane-table");
  return {
    ariaSort: Array.from(lt.tHead.rows[0].cells).map((th) => th.getAttribute("aria-sort") || ""),
    filtered: lt.classList.contains("only-problems"),
    rows: Array.from(lt.tBodies[0].rows).map((tr) => ({
      order: Number(tr.getAttribute("data-order")),
      cell: tr.cells[%d].textContent.trim(),
      problem: tr.classList.contains("problem"),
      visible: tr.getClientRects().length > 0,
    })),
  };
})()`, col)
}

func readTable(t *testing.T, ctx context.Context, col int) tableState {
	t.Helper()
	s, err := chromedp.Run(ctx, chromedp.Evaluate[tableState](tableJS(col)))
	if err != nil {
		t.Fatalf("reading the lane table: %v", err)
	}
	return s
}

// numKey is the sort key of a numeric cell as the page's script defines
// it: "no limit" sorts above every number, text that is no number below.
// The decimal is compared exactly.
type numKey struct {
	inf int // -1, 0 or +1
	r   *big.Rat
}

func parseNumKey(s string) numKey {
	if s == "no limit" {
		return numKey{inf: 1}
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		return numKey{inf: -1}
	}
	return numKey{r: r}
}

func compareNumKey(a, b numKey) int {
	if a.inf != 0 || b.inf != 0 {
		return cmp.Compare(a.inf, b.inf)
	}
	return a.r.Cmp(b.r)
}

// sortedOrders is the data-order sequence the table must show after a sort
// on the cells: by value, ties in document order (the page's tie-break).
func sortedOrders(rows []laneRow, descending bool) []int {
	rs := slices.Clone(rows)
	slices.SortStableFunc(rs, func(a, b laneRow) int {
		c := compareNumKey(parseNumKey(a.Cell), parseNumKey(b.Cell))
		if descending {
			c = -c
		}
		return cmp.Or(c, cmp.Compare(a.Order, b.Order))
	})
	orders := make([]int, len(rs))
	for i, r := range rs {
		orders[i] = r.Order
	}
	return orders
}

func orders(rows []laneRow) []int {
	o := make([]int, len(rows))
	for i, r := range rows {
		o[i] = r.Order
	}
	return o
}

func jsonVerdict(t *testing.T, d *reports.Document) string {
	t.Helper()
	var buf bytes.Buffer
	if err := reports.Write(&buf, d, reports.JSON, reports.Options{}); err != nil {
		t.Fatal(err)
	}
	var j struct {
		Verdict string `json:"verdict"`
	}
	if err := json.Unmarshal(buf.Bytes(), &j); err != nil {
		t.Fatal(err)
	}
	return j.Verdict
}

// TestHTMLInBrowser renders reports of a plan that is not optimal, one that
// is optimal and a network with no feasible plan, opens each in headless
// Chromium, and checks the page from its DOM after the script ran.
func TestHTMLInBrowser(t *testing.T) {
	exe := browserPath(t)
	pages := t.TempDir()
	shots := artifactDir(t)
	browser := startBrowser(t, exe)

	t.Run("detectors", func(t *testing.T) {
		testDetectors(t, browser, pages)
	})

	// The verdicts are not expected values here: each page must show the
	// verdict its own JSON report gives.
	byName := map[string]fixture{}
	for _, f := range fixtures() {
		byName[f.name] = f
	}
	for _, name := range []string{"demo", "glpk_sample", "infeasible"} {
		t.Run(name, func(t *testing.T) {
			f, ok := byName[name]
			if !ok {
				t.Fatalf("no fixture %q", name)
			}
			d := build(t, f)
			var buf bytes.Buffer
			if err := reports.Write(&buf, d, reports.HTML, reports.Options{Rows: 0}); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join(pages, name+".html")
			if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			checkPage(t, browser, path, shots, name, d)
		})
	}
}

// checkPage opens one report and checks it.
func checkPage(t *testing.T, browser context.Context, path, shots, name string, d *reports.Document) {
	ctx, w, closeTab := openTab(t, browser, fileURL(path))
	defer closeTab()

	// The screenshot comes first so that a failing check still leaves it.
	if shot, err := screenshot(ctx, shots, "report-"+name); err != nil {
		t.Errorf("screenshot: %v", err)
	} else {
		t.Logf("screenshot: %s", shot)
	}

	facts, err := chromedp.Run(ctx, chromedp.Evaluate[pageFacts](factsJS))
	if err != nil {
		t.Fatalf("reading the page: %v", err)
	}

	// The verdict shown is the JSON report's verdict.
	verdict := jsonVerdict(t, d)
	var shown []string
	for _, c := range facts.VerdictClasses {
		if strings.HasPrefix(c, "verdict-") {
			shown = append(shown, strings.TrimPrefix(c, "verdict-"))
		}
	}
	if len(shown) != 1 || shown[0] != verdict {
		t.Errorf("#verdict shows verdict(s) %q (classes %q); the JSON report says %q", shown, facts.VerdictClasses, verdict)
	}
	if facts.VerdictLine == "" {
		t.Error("the verdict line is empty")
	}
	if !facts.Caution || facts.CautionText == "" {
		t.Errorf("#caution present %v, text %q", facts.Caution, facts.CautionText)
	}

	// Every lane and node is drawn (all fixtures have fewer lanes than the
	// drawing's limit), and the svg's counts say so.
	if facts.DrawnLanes != d.NumLanes() || facts.SVGLanes != fmt.Sprint(d.NumLanes()) {
		t.Errorf("drawing has %d [data-lane] and data-lanes=%q; the network has %d lanes", facts.DrawnLanes, facts.SVGLanes, d.NumLanes())
	}
	if facts.DrawnNodes != d.NumNodes() || facts.SVGNodes != fmt.Sprint(d.NumNodes()) {
		t.Errorf("drawing has %d [data-node] and data-nodes=%q; the network has %d nodes", facts.DrawnNodes, facts.SVGNodes, d.NumNodes())
	}
	if facts.Rows != d.NumLanes() {
		t.Errorf("lane table has %d rows; the network has %d lanes (Rows: 0 shows all)", facts.Rows, d.NumLanes())
	}
	for _, h := range facts.Heads {
		if !h.Button {
			t.Errorf("lane table header %q has no button", h.Name)
		}
	}

	checkTablesFit(t, ctx, "as opened")
	checkDetails(t, ctx, d)
	checkPrint(t, ctx)
	checkSort(t, ctx, facts)
	checkFilter(t, ctx)
	checkTablesFit(t, ctx, "sorted and filtered")

	errs, requests := w.snapshot()
	for _, e := range errs {
		t.Errorf("console: %s", e)
	}
	for _, u := range requests {
		t.Errorf("the page requested %s", u)
	}
	t.Logf("%s: verdict %s, %d lanes, %d nodes drawn, %d console errors, %d requests", name, verdict, facts.DrawnLanes, facts.DrawnNodes, len(errs), len(requests))
}

// tableFit is the width of one .table-wrap box and of what it holds, in
// CSS pixels, as the browser laid them out.
type tableFit struct {
	Table       string `json:"table"`
	ScrollWidth int    `json:"scrollWidth"`
	ClientWidth int    `json:"clientWidth"`
	PageScroll  int    `json:"pageScroll"`
	PageClient  int    `json:"pageClient"`
	Viewport    int    `json:"viewport"`
}

const fitJS = `(() => {
  const root = document.documentElement;
  return Array.from(document.querySelectorAll(".table-wrap")).map((w) => {
    const t = w.querySelector("table");
    return {table: t ? t.id : "", scrollWidth: w.scrollWidth, clientWidth: w.clientWidth,
      pageScroll: root.scrollWidth, pageClient: root.clientWidth, viewport: window.innerWidth};
  });
})()`

// checkTablesFit checks that at browserWidth every table fits its
// .table-wrap box: the box has nothing to scroll sideways (scrollWidth is
// at most clientWidth), and neither has the page. when says what the
// reader did to the page before.
func checkTablesFit(t *testing.T, ctx context.Context, when string) {
	t.Helper()
	fits, err := chromedp.Run(ctx, chromedp.Evaluate[[]tableFit](fitJS))
	if err != nil {
		t.Fatalf("measuring the tables: %v", err)
	}
	if len(fits) == 0 {
		t.Fatal("no .table-wrap on the page")
	}
	for _, f := range fits {
		if f.Viewport != browserWidth {
			t.Errorf("window is %d CSS pixels wide, want %d", f.Viewport, browserWidth)
		}
		if f.ClientWidth <= 0 || f.ScrollWidth > f.ClientWidth {
			t.Errorf("%s: #%s scrolls sideways at %d px: scrollWidth %d > clientWidth %d", when, f.Table, browserWidth, f.ScrollWidth, f.ClientWidth)
		}
		t.Logf("%s: #%s at %d px: scrollWidth %d, clientWidth %d", when, f.Table, browserWidth, f.ScrollWidth, f.ClientWidth)
	}
	if f := fits[0]; f.PageScroll > f.PageClient {
		t.Errorf("%s: the page scrolls sideways at %d px: scrollWidth %d > clientWidth %d", when, browserWidth, f.PageScroll, f.PageClient)
	}
}

// detailState counts the lane table's detail cells (header included) and
// those shown.
type detailState struct {
	Box     bool `json:"box"`
	Cells   int  `json:"cells"`
	Visible int  `json:"visible"`
	Rows    int  `json:"rows"`
}

const detailJS = `(() => {
  const cells = Array.from(document.querySelectorAll("#lane-table .detail"));
  return {box: document.getElementById("lane-details") !== null, cells: cells.length,
    visible: cells.filter((c) => c.getClientRects().length > 0).length,
    rows: document.getElementById("lane-table").rows.length};
})()`

func readDetails(t *testing.T, ctx context.Context) detailState {
	t.Helper()
	s, err := chromedp.Run(ctx, chromedp.Evaluate[detailState](detailJS))
	if err != nil {
		t.Fatalf("reading the detail columns: %v", err)
	}
	return s
}

// checkDetails checks the "show more columns" box: the carried-over
// columns are hidden at first, all shown while the box is ticked and
// hidden again after. It logs the table's width while they are shown (not
// a check: they may need sideways scrolling on a narrow window).
func checkDetails(t *testing.T, ctx context.Context, d *reports.Document) {
	t.Helper()
	s := readDetails(t, ctx)
	want := len(d.ExtraColumns) * s.Rows // every row, the header's included
	if s.Box != (len(d.ExtraColumns) > 0) || s.Cells != want {
		t.Fatalf("box %v and %d detail cells, want box %v and %d cells (%d carried columns)", s.Box, s.Cells, len(d.ExtraColumns) > 0, want, len(d.ExtraColumns))
	}
	if !s.Box {
		return
	}
	if s.Visible != 0 {
		t.Errorf("%d of %d detail cells shown before ticking #lane-details", s.Visible, s.Cells)
	}
	box := chromedp.CSS("#lane-details")
	if err := chromedp.Do(ctx, chromedp.Click(box)); err != nil {
		t.Fatalf("clicking #lane-details: %v", err)
	}
	if s = readDetails(t, ctx); s.Visible != s.Cells {
		t.Errorf("%d of %d detail cells shown after ticking #lane-details", s.Visible, s.Cells)
	}
	fits, err := chromedp.Run(ctx, chromedp.Evaluate[[]tableFit](fitJS))
	if err != nil {
		t.Fatalf("measuring the tables: %v", err)
	}
	for _, f := range fits {
		if f.Table == "lane-table" {
			t.Logf("#lane-table with %d more columns at %d px: scrollWidth %d, clientWidth %d", len(d.ExtraColumns), browserWidth, f.ScrollWidth, f.ClientWidth)
		}
	}
	if err := chromedp.Do(ctx, chromedp.Click(box)); err != nil {
		t.Fatalf("clicking #lane-details: %v", err)
	}
	if s = readDetails(t, ctx); s.Visible != 0 {
		t.Errorf("%d of %d detail cells still shown after unticking #lane-details", s.Visible, s.Cells)
	}
}

// printWidth is the width in CSS pixels of an A4 page (210 mm at 96 px to
// the inch: 793.7 px) less Chromium's default print margins (0.4 inch,
// 38.4 px, each side): common practice, from memory.
const printWidth = 717

// checkPrint lays the page out for print at printWidth: every lane
// column is there (paper cannot tick a box) and the controls are not. The
// tables' widths are logged, not checked: they depend on the fonts.
func checkPrint(t *testing.T, ctx context.Context) {
	t.Helper()
	media := func(m string, width int64) {
		err := chromedp.Do(ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			if _, err := cdp.Call(ctx, tg, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: m}); err != nil {
				return err
			}
			_, err := cdp.Call(ctx, tg, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{
				Width: width, Height: browserHeight, DeviceScaleFactor: 1})
			return err
		}))
		if err != nil {
			t.Fatalf("emulating %q media at %d px: %v", m, width, err)
		}
	}
	media("print", printWidth)
	defer media("", browserWidth)
	s := readDetails(t, ctx)
	if s.Visible != s.Cells {
		t.Errorf("print: %d of %d detail cells shown", s.Visible, s.Cells)
	}
	controls, err := chromedp.Run(ctx, chromedp.Evaluate[int](`document.querySelectorAll(".controls").length - Array.from(document.querySelectorAll(".controls")).filter((c) => c.getClientRects().length === 0).length`))
	if err != nil {
		t.Fatal(err)
	}
	if controls != 0 {
		t.Errorf("print: %d control paragraph(s) shown", controls)
	}
	fits, err := chromedp.Run(ctx, chromedp.Evaluate[[]tableFit](fitJS))
	if err != nil {
		t.Fatalf("measuring the tables: %v", err)
	}
	for _, f := range fits {
		t.Logf("print at %d px: #%s scrollWidth %d, clientWidth %d", printWidth, f.Table, f.ScrollWidth, f.ClientWidth)
	}
}

// checkSort clicks a numeric column header twice and checks the sort
// marks and the row order after each click.
func checkSort(t *testing.T, ctx context.Context, facts pageFacts) {
	t.Helper()
	// The first numeric column whose ascending order differs from the
	// document order, so that the click must move rows.
	col := -1
	var before tableState
	for i, h := range facts.Heads {
		if h.Sort != "num" {
			continue
		}
		s := readTable(t, ctx, i)
		if !slices.Equal(sortedOrders(s.Rows, false), orders(s.Rows)) {
			col, before = i, s
			break
		}
	}
	if col < 0 {
		t.Fatal("no numeric lane column whose sort would move a row")
	}
	for _, r := range before.Rows {
		if k := parseNumKey(r.Cell); k.inf < 0 && r.Cell != "-" {
			t.Errorf("column %q: cell %q is not a number", facts.Heads[col].Name, r.Cell)
		}
	}
	sel := chromedp.CSS(fmt.Sprintf("#lane-table thead th:nth-child(%d) button", col+1))
	for _, want := range []string{"ascending", "descending"} {
		if err := chromedp.Do(ctx, chromedp.Click(sel)); err != nil {
			t.Fatalf("clicking header %q: %v", facts.Heads[col].Name, err)
		}
		s := readTable(t, ctx, col)
		for i, a := range s.AriaSort {
			switch {
			case i == col && a != want:
				t.Errorf("after click: th %q aria-sort=%q, want %q", facts.Heads[i].Name, a, want)
			case i != col && a != "":
				t.Errorf("after click on %q: th %q still has aria-sort=%q", facts.Heads[col].Name, facts.Heads[i].Name, a)
			}
		}
		if got, exp := orders(s.Rows), sortedOrders(before.Rows, want == "descending"); !slices.Equal(got, exp) {
			t.Errorf("%s sort on %q: row order %v, want %v", want, facts.Heads[col].Name, got, exp)
		}
		for i := 1; i < len(s.Rows); i++ {
			c := compareNumKey(parseNumKey(s.Rows[i-1].Cell), parseNumKey(s.Rows[i].Cell))
			if (want == "ascending" && c > 0) || (want == "descending" && c < 0) {
				t.Errorf("%s sort on %q: %q before %q", want, facts.Heads[col].Name, s.Rows[i-1].Cell, s.Rows[i].Cell)
			}
		}
	}
}

// checkFilter ticks "problem lanes only" and checks that exactly the
// problem rows stay visible.
func checkFilter(t *testing.T, ctx context.Context) {
	t.Helper()
	s := readTable(t, ctx, 0)
	for _, r := range s.Rows {
		if !r.Visible {
			t.Errorf("lane %q hidden before filtering", r.Cell)
		}
	}
	if s.Filtered {
		t.Error("#lane-table has class only-problems before the box is ticked")
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#problem-only"))); err != nil {
		t.Fatalf("clicking #problem-only: %v", err)
	}
	s = readTable(t, ctx, 0)
	if !s.Filtered {
		t.Error("#lane-table lacks class only-problems after ticking #problem-only")
	}
	problems := 0
	for _, r := range s.Rows {
		if r.Problem {
			problems++
		}
		if r.Visible != r.Problem {
			t.Errorf("filtered: lane %q visible %v, problem %v", r.Cell, r.Visible, r.Problem)
		}
	}
	t.Logf("filter: %d of %d lanes are problem lanes", problems, len(s.Rows))
}

// testDetectors opens a page that does each thing the report must not do
// and checks that the watch sees each one, so that a clean report is clean
// because it is, not because nothing was watched.
func testDetectors(t *testing.T, browser context.Context, dir string) {
	// The first script is allowed by its hash; the second is not.
	const allowed = `console.error("detector: console error"); throw new Error("detector: exception");`
	sum := sha256.Sum256([]byte(allowed))
	const remote = "http://192.0.2.1/detector.png" // TEST-NET-1 (RFC 5737): routes nowhere
	html := `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src http:; script-src 'sha256-` + base64.StdEncoding.EncodeToString(sum[:]) + `'">
<title>detectors</title></head><body><p>detectors</p>
<img src="` + remote + `" alt="">
<script>` + allowed + `</script>
<script>document.title = "inline script ran";</script>
</body></html>`
	path := filepath.Join(dir, "detectors.html")
	if err := os.WriteFile(path, []byte(html), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, w, closeTab := openTab(t, browser, fileURL(path))
	defer closeTab()

	want := []struct {
		what string
		seen func(errs, requests []string) bool
	}{
		{"console.error call", func(errs, _ []string) bool {
			return slices.ContainsFunc(errs, func(e string) bool {
				return strings.HasPrefix(e, "console.error") && strings.Contains(e, "detector: console error")
			})
		}},
		{"uncaught exception", func(errs, _ []string) bool {
			return slices.ContainsFunc(errs, func(e string) bool {
				return strings.HasPrefix(e, "exception") && strings.Contains(e, "detector: exception")
			})
		}},
		{"Content-Security-Policy violation", func(errs, _ []string) bool {
			return slices.ContainsFunc(errs, func(e string) bool { return strings.Contains(e, "Content Security Policy") })
		}},
		{"request to " + remote, func(_, requests []string) bool { return slices.Contains(requests, remote) }},
	}
	// Log entries can arrive a little after the load event.
	var errs, requests []string
	for range 40 {
		errs, requests = w.snapshot()
		all := true
		for _, x := range want {
			all = all && x.seen(errs, requests)
		}
		if all {
			break
		}
		if err := chromedp.Do(ctx, chromedp.Sleep(50*time.Millisecond)); err != nil {
			t.Fatal(err)
		}
	}
	for _, x := range want {
		if !x.seen(errs, requests) {
			t.Errorf("the watch missed the %s; errors %q, requests %q", x.what, errs, requests)
		}
	}
	t.Logf("seen: errors %q; requests %q", errs, requests)
	title, err := chromedp.Run(ctx, chromedp.Title())
	if err != nil {
		t.Fatal(err)
	}
	if title != "detectors" {
		t.Errorf("title %q: the script the policy forbids ran", title)
	}
}
