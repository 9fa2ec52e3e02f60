package main

// This file holds how bivar stops on SIGINT and SIGTERM: the first signal
// cancels the command's context; the command stops before its next step,
// removes its temporary files, keeps the previous output and exits with
// 128 + the signal's number, as a shell reports a process it stopped.

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

// Exit statuses after a signal.
const (
	exitInterrupted = 130 // SIGINT (Ctrl-C): 128 + 2
	exitTerminated  = 143 // SIGTERM: 128 + 15
)

// signalError is the cause of the context's cancellation by a signal.
type signalError struct{ sig os.Signal }

func (e *signalError) Error() string { return "stopped by " + signalName(e.sig) }

// withSignals returns a context that the first SIGINT or SIGTERM cancels,
// with a *signalError as its cause, and a function that stops listening.
// Only the first signal is caught: a second one stops bivar at once, and
// the next run clears what that leaves behind.
func withSignals(parent context.Context) (context.Context, func()) {
	ctx, cancel := context.WithCancelCause(parent)
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, os.Interrupt, syscall.SIGTERM)
	done := make(chan struct{})
	go func() {
		select {
		case sig := <-ch:
			signal.Stop(ch)
			cancel(&signalError{sig})
		case <-done:
		}
	}()
	return ctx, func() {
		signal.Stop(ch)
		close(done)
		cancel(nil)
	}
}

// stopped returns the signal that cancelled ctx, or nil.
func stopped(ctx context.Context) os.Signal {
	if se, ok := context.Cause(ctx).(*signalError); ok {
		return se.sig
	}
	return nil
}

// interrupted tells the user that a signal stopped the command and what
// was kept ("" when the command writes nothing), and returns the exit
// status.
func interrupted(stderr io.Writer, who string, sig os.Signal, kept string) int {
	if kept == "" {
		fmt.Fprintf(stderr, "%s: stopped by %s\n", who, signalName(sig))
	} else {
		fmt.Fprintf(stderr, "%s: stopped by %s; nothing written: %s\n", who, signalName(sig), kept)
	}
	if s, ok := sig.(syscall.Signal); ok {
		return 128 + int(s)
	}
	return exitFailed
}

func signalName(sig os.Signal) string {
	switch sig {
	case os.Interrupt:
		return "SIGINT"
	case syscall.SIGTERM:
		return "SIGTERM"
	}
	return sig.String()
}
