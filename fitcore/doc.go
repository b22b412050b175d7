// Package fitcore is Pairline's numerical core: straight-line fits of paired
// readings, their inference, assumption checks, transform advice and the use
// of the fitted line (prediction, inverse prediction, detection limits and
// acceptance criteria).
//
// The package is pure Go: it does no I/O, holds no global state and imports
// neither syscall/js nor any UI code, so the browser build and the native
// command compute exactly the same numbers. Every exported function takes
// data and options and returns values or an error; none panics on bad data
// and no NaN or Inf ever reaches a verdict.
//
// The main entry point is [Analyze], which returns a [Report].
package fitcore
