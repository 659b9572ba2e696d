// Package samples ships the demo data of areatest.
//
// The demo region is Halvaren, an invented stretch of coast with a few
// offshore islands, divided into 200 districts in 5 provinces. It lies on a
// 3° × 2° box of open South Atlantic water, so it cannot be mistaken for a
// real place, and its attributes were drawn at random by package
// samples/region: a case rate that clusters in space, a prevention policy
// adopted by groups of neighbouring districts, and only a weak link between
// them — the setting in which shuffling the policy labels freely overstates
// the evidence. The data are invented for demonstrations and must never be
// used to check a statistic.
package samples
