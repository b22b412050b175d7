// Package e2e holds Pairline's browser tests: they start the real
// `pairline serve` and drive Debian's Chromium headless with chromedp.
// They are built only with the e2e tag (`make browser`, part of `make test`).
package e2e
