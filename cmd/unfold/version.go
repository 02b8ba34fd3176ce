package main

import "runtime/debug"

// versionString is the text of `unfold --version` and the "version" field of JSON output.
func versionString() string {
	c := commit
	if c == "" {
		if info, ok := debug.ReadBuildInfo(); ok {
			for _, s := range info.Settings {
				if s.Key == "vcs.revision" && len(s.Value) >= 12 {
					c = s.Value[:12]
				}
			}
		}
	}
	if c == "" {
		c = "unknown"
	}
	return version + " (commit " + c + ")"
}
