package main

// moreCommands returns the subcommands beyond profile.
func moreCommands() []*command {
	return []*command{diffCommand(), hammerCommand(), goldenCommand(), changesCommand(), genCommand(), demoCommand()}
}
