package regress

import "fmt"

// TooFewAreasError reports a model with no residual degree of freedom left:
// least squares needs more areas than coefficients (the intercept and one
// per covariate).
type TooFewAreasError struct {
	Areas, Coefficients int
}

func (e *TooFewAreasError) Error() string {
	return fmt.Sprintf("regress: %d areas are too few for %d coefficients (the intercept and the covariates); the model needs more areas than coefficients", e.Areas, e.Coefficients)
}

// CollinearError reports a covariate that is constant or a linear
// combination of the intercept and the covariates before it, so that the
// model has no unique fit.
type CollinearError struct {
	// Covariate is the name of the offending covariate.
	Covariate string
}

func (e *CollinearError) Error() string {
	return fmt.Sprintf("regress: covariate %q is constant or a linear combination of the intercept and the covariates before it, so the model has no unique fit; leave it out", e.Covariate)
}

// ValueError reports a value that is not a finite number, or columns whose
// lengths do not match.
type ValueError struct {
	// Column is the outcome's or the covariate's name.
	Column string
	// Index is the area, or −1 for a length mismatch.
	Index int
	// Problem says what is wrong, in words.
	Problem string
}

func (e *ValueError) Error() string {
	if e.Index < 0 {
		return fmt.Sprintf("regress: %s: %s", e.Column, e.Problem)
	}
	return fmt.Sprintf("regress: %s, area %d: %s", e.Column, e.Index, e.Problem)
}
