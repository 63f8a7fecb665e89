package flow_test

import (
	"math"
	"strings"
	"testing"

	"lanecert/flow"
)

func TestHaversine(t *testing.T) {
	cases := []struct {
		name                   string
		lat1, lon1, lat2, lon2 float64
		r, want, tol           float64
	}{
		// Rosetta Code, "Haversine formula" task: Nashville International
		// Airport (36.12, -86.67) to Los Angeles International Airport
		// (33.94, -118.40) with R = 6372.8 km gives 2887.2599506071106 km
		// (from memory).
		{"BNA-LAX", 36.12, -86.67, 33.94, -118.40, 6372.8, 2887.2599506071106, 1e-6},
		// Exact geometry (common practice): a quarter meridian is πR/2,
		// antipodes are πR apart, a point is 0 from itself.
		{"quarter meridian", 0, 0, 90, 0, flow.EarthRadiusKm, math.Pi * flow.EarthRadiusKm / 2, 1e-9},
		{"antipodes", 10, 20, -10, -160, flow.EarthRadiusKm, math.Pi * flow.EarthRadiusKm, 1e-6},
		{"same point", 51.5, -0.1, 51.5, -0.1, flow.EarthRadiusKm, 0, 0},
		// One degree of longitude on the equator is 2πR/360 (common practice).
		{"equator degree", 0, 0, 0, 1, flow.EarthRadiusKm, 2 * math.Pi * flow.EarthRadiusKm / 360, 1e-9},
	}
	for _, c := range cases {
		got := flow.HaversineR(c.lat1, c.lon1, c.lat2, c.lon2, c.r)
		if math.Abs(got-c.want) > c.tol {
			t.Errorf("%s: %.10f km, want %.10f", c.name, got, c.want)
		}
	}
}

func TestProposeLanes(t *testing.T) {
	lanes := "from,to,cost,max\nP1,C1,5,10\nP2,C2,4,10\n"
	nodes := "node,supply,lat,lon\nP1,30,0,0\nP2,30,0,2\nC1,-20,0,1\nC2,-20,0,3\n"
	n, _, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "l.csv", strings.NewReader(nodes), "n.csv", flow.TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	lat, lon, ok, err := flow.Coordinates(n)
	if err != nil || !ok {
		t.Fatal(ok, err)
	}
	perKm, _ := flow.ParseDecimal("0.01")
	perUnit, _ := flow.ParseDecimal("2")
	c1 := flow.NodeID(2)
	cs, km, err := flow.ProposeLanes(n, []flow.NodeID{c1}, lat, lon, flow.RateModel{PerKm: perKm, PerUnit: perUnit}, 1)
	if err != nil {
		t.Fatal(err)
	}
	// C1 at longitude 1 is one equator degree from both origins; ties go to
	// the lower node number (P1). Rate = 0.01 × 111.19 km + 2 = 3.11 (to
	// the network's 0 rate places: 3).
	if len(cs) != 1 || cs[0].Tail != 0 || cs[0].Head != c1 || math.Abs(km[0]-111.195) > 0.01 || cs[0].Rate != 3 {
		t.Fatalf("proposals %+v, km %v", cs, km)
	}
}
