package publish

import (
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"
)

// holderInfo is what a lock holder writes into the lock file: its process
// id, the time it took the lock and its command, a "key=value" line each.
func holderInfo(command string) string {
	return fmt.Sprintf("pid=%d\nsince=%s\ncommand=%s\n", os.Getpid(), time.Now().UTC().Format(time.RFC3339), command)
}

// parseHolder reads holderInfo's lines back into a BusyError (fields left
// zero where a line is missing or unreadable).
func parseHolder(b []byte) *BusyError {
	e := &BusyError{}
	for _, line := range strings.Split(string(b), "\n") {
		k, v, _ := strings.Cut(line, "=")
		switch k {
		case "pid":
			e.PID, _ = strconv.Atoi(v)
		case "since":
			e.Since, _ = time.Parse(time.RFC3339, v)
		case "command":
			e.Command = v
		}
	}
	return e
}
