package publish

import (
	"context"
	"errors"
	"io/fs"
	"os"
)

// Step is one change to the file system made while publishing, reported
// to a trace before it is made.
type Step struct {
	Op   string // "mkdir", "write", "rename", "exchange" or "remove"
	Path string // the entry created, written, put in place or removed
}

type traceKey struct{}

// WithTrace returns a context whose publishing steps are reported to fn
// before each is made, as net/http/httptrace reports a request's events.
// Tests use it to stop a process at every step.
func WithTrace(ctx context.Context, fn func(Step)) context.Context {
	return context.WithValue(ctx, traceKey{}, fn)
}

func traceFrom(ctx context.Context) func(Step) {
	fn, _ := ctx.Value(traceKey{}).(func(Step))
	return fn
}

// stepper makes the steps of one publish: before each it checks for a
// cancellation and reports to the trace.
type stepper struct {
	ctx   context.Context
	trace func(Step)
}

// step is called before a step that a cancellation may still prevent.
func (s *stepper) step(op, path string) error {
	if s.ctx.Err() != nil {
		return context.Cause(s.ctx)
	}
	s.after(op, path)
	return nil
}

// after reports a step that goes ahead whatever the context says.
func (s *stepper) after(op, path string) {
	if s.trace != nil {
		s.trace(Step{Op: op, Path: path})
	}
}

// writeFile creates path (which must not exist), writes data and syncs it.
func (s *stepper) writeFile(path string, data []byte, mode fs.FileMode) error {
	if err := s.step("write", path); err != nil {
		return err
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, mode)
	if err != nil {
		return err
	}
	_, err = f.Write(data)
	if err == nil {
		err = f.Chmod(mode)
	}
	if err == nil {
		err = f.Sync()
	}
	return errors.Join(err, f.Close())
}
