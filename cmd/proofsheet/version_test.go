package main

import (
	"runtime/debug"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestVersionText(t *testing.T) {
	info := &debug.BuildInfo{
		GoVersion: "go1.26.8",
		Main:      debug.Module{Path: "github.com/proofsheet/proofsheet", Version: "v0.4.1"},
		Settings: []debug.BuildSetting{
			{Key: "vcs", Value: "git"},
			{Key: "vcs.revision", Value: "0123456789abcdef0123456789abcdef01234567"},
			{Key: "vcs.time", Value: "2026-04-01T06:00:00Z"},
			{Key: "vcs.modified", Value: "true"},
		},
	}
	require.Equal(t, "proofsheet v0.4.1 (github.com/proofsheet/proofsheet)\n"+
		"revision 0123456789abcdef0123456789abcdef01234567+modified (2026-04-01T06:00:00Z)\n"+
		"built with go1.26.8\n", versionText(info, true))

	info.Main.Version, info.Settings = "(devel)", nil
	require.Equal(t, "proofsheet (devel) (github.com/proofsheet/proofsheet)\n"+
		"revision unknown (built without VCS information, e.g. with -buildvcs=false)\n"+
		"built with go1.26.8\n", versionText(info, true))
	require.Equal(t, "proofsheet (no build information in this binary)\n", versionText(nil, false))
}

func TestVersionCommand(t *testing.T) {
	for _, arg := range []string{"--version", "-version", "version"} {
		r := runBin(t, "", nil, arg)
		require.Equal(t, exitSame, r.code, r.stderr)
		// The binary's own build info, as runtime/debug reads it.
		require.True(t, strings.HasPrefix(r.stdout, "proofsheet "), r.stdout)
		require.Contains(t, r.stdout, "(github.com/proofsheet/proofsheet)")
		require.Contains(t, r.stdout, "built with go1.")
	}
}
