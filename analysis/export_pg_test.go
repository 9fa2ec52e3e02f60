package analysis

// SetPushdownSuspectMax lowers the most flagged rows a pushed-down study
// fetches, for a test of what it does with more; the returned function
// restores it.
func SetPushdownSuspectMax(n int) (restore func()) {
	old := pushdownSuspectMax
	pushdownSuspectMax = n
	return func() { pushdownSuspectMax = old }
}
