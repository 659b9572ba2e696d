// Package kdtree is the static k-d tree behind the distance-based graphs of
// package weights. Build arranges the points; NearestRows answers the k
// nearest neighbours of every point, and Within the points in reach of one.
//
// The tree prunes with a cheap embedding (Point.C) in which straight-line
// distance grows with the metric's distance, and leaves every decision to the
// metric's exact distance, which the caller gives to Build: rankings and
// thresholds are then those of the metric, to the last bit, whatever the
// embedding's rounding (Slack covers it).
package kdtree
