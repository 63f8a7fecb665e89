package flow

// Sifted reports whether Solve's warm start sifted (see siftMinLanes).
func Sifted(sol *Solution) bool { return sol.sifted }

// SolveSifting is Solve from start, sifting whenever the plan allows (a
// network whose supply equals its demand, no lane minimums), whatever the
// network's size.
func SolveSifting(n *Network, start []int64) (*Solution, error) {
	return Solve(n, SolveOptions{Start: start, siftAlways: true})
}
