package demo_test

import (
	"fmt"
	"time"

	"pairline/app/demo"
)

// The demo is four invented sessions of the fictional Larkwater Valley
// Water Board.
func ExampleSessions() {
	ss, err := demo.Sessions(time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC), nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range ss {
		fmt.Println(s.Title, "—", len(s.Readings), "readings")
	}
	// Output:
	// Demo (invented): conductivity probe calibration — 14 readings
	// Demo (invented): turbidity against suspended solids — 32 readings
	// Demo (invented): pressure transmitter check — 14 readings
	// Demo (invented): water-level logger drift — 42 readings
}
