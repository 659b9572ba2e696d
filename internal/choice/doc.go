// Package choice reads a value given by name — an option value such as
// "queen", "Rook" or " bh " — with one rule for the whole project: case
// and surrounding space do not matter, and an unknown name is an error that
// lists the names there are. It sits below every layer (Go keeps internal/
// out of the API).
package choice
