package ui

// SaveState is where the open session's last change stands on the device.
// Its String is the save-status element's data-state ("" before the first
// save), which the browser tests read.
type SaveState int

const (
	SaveNone   SaveState = iota // nothing saved or pending yet for the open session
	SaveSaving                  // a change is waiting to be written
	SaveSaved                   // the last change is on the device
	SaveFailed                  // the last change could not be written (see Shell.saveWhy)
)

// String is the state's name as data-state shows it.
func (s SaveState) String() string {
	switch s {
	case SaveSaving:
		return "saving"
	case SaveSaved:
		return "saved"
	case SaveFailed:
		return "failed"
	}
	return ""
}
