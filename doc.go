// Package loopmatch is the root of the loopmatch module: one- and two-loop matching of heavy
// particles onto effective operators, with RG running and code generation. See README.md and
// docs/ARCHITECTURE.md for the package map.
package loopmatch
