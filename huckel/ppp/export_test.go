package ppp

// SetMaxIter changes the SCF cycle cap for a test and returns the function restoring it.
func SetMaxIter(n int) func() {
	old := maxIter
	maxIter = n
	return func() { maxIter = old }
}
