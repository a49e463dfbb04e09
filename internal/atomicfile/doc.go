// Package atomicfile writes files so that a reader, a crash or a killed
// process never sees half of one, and so that a crash leaves as little
// behind as the system allows. It is internal: fixtures.WriteFileAtomic
// and fixtures.WriteFileAtomicWith are the API over it, used by golden
// files, table files and the CLI's reports.
//
// A file is written to a temporary file in the target's directory, synced,
// then renamed over the target. On Linux the temporary file is made with
// O_TMPFILE, which has no name until the write is complete, so a crash
// while writing leaves nothing; elsewhere (or on a file system without
// O_TMPFILE) it has a name that says whose and what it is:
//
//	.report_gold_tbl.proofsheet-tmp-4242-1699999999
//
// (a leading dot, the target's name with its dots made underscores, so it
// never matches patterns such as *.gold.tbl or *.gold.*, the writer's
// process id, a random number). Before a target is written, temporary
// files of that target left by a killed run — proofsheet's own, made
// before the current process started, by a process that is no longer
// running — are removed.
//
// Typical use:
//
//	err := atomicfile.Write(path, 0o644, func(w io.Writer) error {
//		_, err := w.Write(data)
//		return err
//	})
package atomicfile
