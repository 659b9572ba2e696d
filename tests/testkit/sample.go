package testkit

// MeanVar returns the mean of y and its sample variance (divisor n − 1),
// in two passes.
func MeanVar(y []float64) (mean, variance float64) {
	for _, x := range y {
		mean += x
	}
	mean /= float64(len(y))
	for _, x := range y {
		variance += (x - mean) * (x - mean)
	}
	return mean, variance / float64(len(y)-1)
}
