package flow

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// EarthRadiusKm is the mean Earth radius (IUGG: 6371.0088 km) used by
// Haversine.
const EarthRadiusKm = 6371.0088

// Haversine returns the great-circle distance in kilometres between two
// points given in decimal degrees, by the haversine formula on a sphere of
// radius EarthRadiusKm. Distances feed estimated rates only, never a
// verdict, so floating point is fine here.
func Haversine(lat1, lon1, lat2, lon2 float64) float64 {
	return HaversineR(lat1, lon1, lat2, lon2, EarthRadiusKm)
}

// HaversineR is Haversine on a sphere of radius r.
func HaversineR(lat1, lon1, lat2, lon2, r float64) float64 {
	const rad = math.Pi / 180
	dlat := (lat2 - lat1) * rad
	dlon := (lon2 - lon1) * rad
	a := math.Sin(dlat/2)*math.Sin(dlat/2) + math.Cos(lat1*rad)*math.Cos(lat2*rad)*math.Sin(dlon/2)*math.Sin(dlon/2)
	return 2 * r * math.Asin(math.Min(1, math.Sqrt(a)))
}

// Coordinates returns each node's latitude and longitude from the node
// table's lat and lon columns (also latitude, longitude, lng). ok is false
// when the columns are missing; a node without coordinates gets NaN. An
// unreadable or out-of-range value is an error naming the node.
func Coordinates(n *Network) (lat, lon []float64, ok bool, err error) {
	if n.NodeExtra == nil {
		return nil, nil, false, nil
	}
	li, oi := -1, -1
	for c, name := range n.NodeExtra.Names {
		switch strings.ToLower(strings.TrimSpace(name)) {
		case "lat", "latitude":
			li = c
		case "lon", "lng", "longitude":
			oi = c
		}
	}
	if li < 0 || oi < 0 {
		return nil, nil, false, nil
	}
	lat, lon = make([]float64, n.NumNodes()), make([]float64, n.NumNodes())
	for v := range lat {
		lat[v], lon[v] = math.NaN(), math.NaN()
		row := n.NodeExtra.Values[v]
		if row == nil || strings.TrimSpace(row[li]) == "" || strings.TrimSpace(row[oi]) == "" {
			continue
		}
		a, err1 := strconv.ParseFloat(strings.TrimSpace(row[li]), 64)
		b, err2 := strconv.ParseFloat(strings.TrimSpace(row[oi]), 64)
		if err1 != nil || err2 != nil || math.Abs(a) > 90 || math.Abs(b) > 180 {
			return nil, nil, false, fmt.Errorf("flow: node %q: coordinates %q, %q: want decimal degrees, latitude -90..90 and longitude -180..180", n.Nodes[v], row[li], row[oi])
		}
		lat[v], lon[v] = a, b
	}
	return lat, lon, true, nil
}

// RateModel estimates a lane's rate from its great-circle length: PerKm per
// unit and kilometre plus PerUnit per unit (both in the network's rate
// units, as decimals).
type RateModel struct {
	PerKm, PerUnit Decimal
}

// Estimate returns the model's rate for km kilometres on the network's rate
// scale, rounded to the nearest scaled unit. It is an estimate, not a
// quote.
func (m RateModel) Estimate(n *Network, km float64) (int64, error) {
	perKm := float64(m.PerKm.Mant) / math.Pow10(int(m.PerKm.Places))
	perUnit := float64(m.PerUnit.Mant) / math.Pow10(int(m.PerUnit.Places))
	v := (perKm*km + perUnit) * math.Pow10(n.RatePlaces)
	if math.IsNaN(v) || math.Abs(v) >= 1<<62 {
		return 0, fmt.Errorf("flow: estimated rate for %.1f km %w", km, ErrOverflow)
	}
	return int64(math.Round(v)), nil
}

// ProposeLanes proposes candidate lanes into a short region: for every
// destination in region, lanes from the k nearest origins outside it (by
// great-circle distance), priced by the rate model and without capacity.
// Nodes without coordinates are skipped. The result is sorted by
// destination, then distance, then origin; ids are "est:FROM>TO".
func ProposeLanes(n *Network, region []NodeID, lat, lon []float64, m RateModel, k int) ([]Candidate, []float64, error) {
	in := make([]bool, n.NumNodes())
	for _, v := range region {
		in[v] = true
	}
	var origins []NodeID
	for v, b := range n.Supply {
		if b > 0 && !in[v] && !math.IsNaN(lat[v]) {
			origins = append(origins, NodeID(v))
		}
	}
	var out []Candidate
	var dist []float64
	for _, d := range region {
		if n.Supply[d] >= 0 || math.IsNaN(lat[d]) {
			continue
		}
		type near struct {
			o  NodeID
			km float64
		}
		ns := make([]near, 0, len(origins))
		for _, o := range origins {
			ns = append(ns, near{o, Haversine(lat[o], lon[o], lat[d], lon[d])})
		}
		sort.Slice(ns, func(i, j int) bool {
			if ns[i].km != ns[j].km {
				return ns[i].km < ns[j].km
			}
			return ns[i].o < ns[j].o
		})
		for _, x := range ns[:min(k, len(ns))] {
			rate, err := m.Estimate(n, x.km)
			if err != nil {
				return nil, nil, err
			}
			out = append(out, Candidate{ID: "est:" + n.Nodes[x.o] + ">" + n.Nodes[d], Tail: x.o, Head: d, Rate: rate, Upper: NoLimit, Same: -1})
			dist = append(dist, x.km)
		}
	}
	return out, dist, nil
}
