package analysis

// SetPushdownSuspectMax lowers the most flagged rows a pushed-down study
// fetches, for a test of what it does with more; the returned function
// restores it.
func SetPushdownSuspectMax(n int) (restore func()) {
	old := pushdownSuspectMax
	pushdownSuspectMax = n
	return func() { pushdownSuspectMax = old }
}

// SetSecondSession turns off (or on) the second session of push-down
// studies, as when the server cannot share its snapshot; the returned
// function restores it.
func SetSecondSession(on bool) (restore func()) {
	old := secondSession
	secondSession = on
	return func() { secondSession = old }
}
