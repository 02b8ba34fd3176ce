package series

import (
	"fmt"
	"math"
)

// Check validates the reading options (the zero value is valid: every field chosen).
func (o ReadOptions) Check() error {
	if o.Dt != 0 {
		if err := CheckDt(o.Dt); err != nil {
			return err
		}
	}
	if o.Channel < 0 {
		return CheckChannel(o.Channel)
	}
	return nil
}

// Check validates the preprocessing options (the zero value is valid: nothing done).
func (p Prep) Check() error {
	if p.Decimate < 0 {
		return CheckDecimate(p.Decimate)
	}
	return nil
}

// CheckDt validates a sampling interval given by the user: positive and finite.
func CheckDt(dt float64) error {
	if !(dt > 0) || math.IsInf(dt, 0) {
		return fmt.Errorf("--dt %g: want a positive, finite sampling interval", dt)
	}
	return nil
}

// CheckChannel validates a WAV channel given by the user (1-based).
func CheckChannel(c int) error {
	if c < 1 {
		return fmt.Errorf("--channel %d: want at least 1 (channels are counted from 1)", c)
	}
	return nil
}

// CheckDecimate validates a decimation factor given by the user.
func CheckDecimate(k int) error {
	if k < 1 {
		return fmt.Errorf("--decimate %d: want at least 1 (1 keeps every sample)", k)
	}
	return nil
}
