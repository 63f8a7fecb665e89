package flow

// Sifted reports whether Solve's warm start sifted (see siftMinLanes).
func Sifted(sol *Solution) bool { return sol.sifted }

// SolveSifting is Solve from start, sifting whenever the plan allows (a
// network whose supply equals its demand, no lane minimums), whatever the
// network's size.
func SolveSifting(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, siftAlways: true})
}

// Swept reports whether Solve's warm start searched by sweeps (see
// sweepMinLanes).
func Swept(sol *Solution) bool { return sol.swept }

// SolveSweeping is Solve from start with the warm start's search by sweeps
// whenever the plan does not sift and the arithmetic allows, whatever the
// network's size.
func SolveSweeping(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, sweepAlways: true})
}

// SolveWithoutRounds is Solve from start with the warm start's rounds of
// cancelling before its search by lists skipped.
func SolveWithoutRounds(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, noRounds: true})
}

// Piled reports whether Solve's warm start searched once more after its
// first search refused a pile of lanes (see pileRefusals).
func Piled(sol *Solution) bool { return sol.piled }

// SolvePiling is Solve from start with every first search of the warm
// start by lists that refuses a lane taken for a pile: the refused lanes
// are cancelled and the search made again, even after rounds inside parts.
func SolvePiling(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, pileAlways: true})
}

// SolveWithoutCrash is Solve with a cold start from the artificial tree
// alone, without the first pivots of crash.
func SolveWithoutCrash(n *Network) (*Solution, error) {
	return Solve(n, SolveOptions{noCrash: true})
}

// CrashPivots returns the pivots crash made at the start of a cold solve.
func CrashPivots(sol *Solution) int64 { return sol.crashed }

// SolveCheckingRounds is Solve from start with the warm start's rounds
// checked (see checkRound): what is wrong is in RoundFaults.
func SolveCheckingRounds(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, checkRounds: true})
}

// SolveCheckingRoundsPasses is SolveCheckingRounds with at most passes
// passes inside parts per cancelling (maxWithinPasses otherwise).
func SolveCheckingRoundsPasses(n *Network, start []int64, passes int) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, checkRounds: true, maxPasses: passes})
}

// RoundFaults returns what SolveCheckingRounds found wrong.
func RoundFaults(sol *Solution) []string { return sol.faults }

// WithinPasses returns the passes over the lanes that the warm start's
// cancelling made inside parts (see maxWithinPasses).
func WithinPasses(sol *Solution) int { return sol.within }

// SiftKeptPricings returns how many pricings of Solve's sifting warm start
// read only the lanes kept by an earlier one (see siftKeep).
func SiftKeptPricings(sol *Solution) int { return sol.siftKept }
