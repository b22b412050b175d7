package wording

// Criterion names an acceptance criterion of fitcore (CriterionResult.Name:
// "r_squared", "slope", "intercept", "max_residual") in the words of the
// screen and the report; a name it does not know is returned as it is.
func Criterion(name string) string {
	switch name {
	case "r_squared":
		return "R² at least"
	case "slope":
		return "Slope within"
	case "intercept":
		return "Intercept within"
	case "max_residual":
		return "Largest residual"
	}
	return name
}
