package main

import (
	"fmt"
	"runtime/debug"
	"strings"
)

// versionText describes the build from its build info: the module version
// (a tag when installed with go install …@VERSION, "(devel)" in a
// checkout), the VCS revision and time with a "+modified" mark for a dirty
// tree, and the Go version.
func versionText(info *debug.BuildInfo, ok bool) string {
	if !ok || info == nil {
		return "proofsheet (no build information in this binary)\n"
	}
	version := info.Main.Version
	if version == "" {
		version = "(devel)"
	}
	var b strings.Builder
	fmt.Fprintf(&b, "proofsheet %s", version)
	if info.Main.Path != "" {
		fmt.Fprintf(&b, " (%s)", info.Main.Path)
	}
	b.WriteString("\n")
	settings := map[string]string{}
	for _, s := range info.Settings {
		settings[s.Key] = s.Value
	}
	if rev := settings["vcs.revision"]; rev != "" {
		fmt.Fprintf(&b, "revision %s", rev)
		if settings["vcs.modified"] == "true" {
			b.WriteString("+modified")
		}
		if t := settings["vcs.time"]; t != "" {
			fmt.Fprintf(&b, " (%s)", t)
		}
		b.WriteString("\n")
	} else {
		b.WriteString("revision unknown (built without VCS information, e.g. with -buildvcs=false)\n")
	}
	fmt.Fprintf(&b, "built with %s\n", info.GoVersion)
	return b.String()
}
