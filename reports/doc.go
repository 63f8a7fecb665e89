// Package reports renders audits of package dual for people and programs:
// text tables (via tablewriter), JSON, CSV and Markdown. Every format is
// built from one document (Document), so all of them show the same numbers;
// numbers are exact decimal strings, never floats.
//
// The sign conventions are those of package dual: a node's potential is its
// marginal landed cost; a lane's reduced cost is rate + potential(from) -
// potential(to).
//
// Output is deterministic: the same audit gives the same bytes.
package reports

// Caution is printed with every report: cost optimality is all that is
// checked.
const Caution = "lanecert checks cost optimality only. Loads must still respect weight limits, driving-hours rules, hazardous-goods rules, local regulations and licensed practice."
