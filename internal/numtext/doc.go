// Package numtext writes numbers the way the project's messages and
// reports print them. It sits below every layer (Go keeps internal/ out of
// the API), so that a library's warning and a report's table agree.
package numtext
