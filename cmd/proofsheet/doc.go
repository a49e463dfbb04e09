// Command proofsheet gives proofsheet's table comparison, golden-file
// review, raw-file profiling and mess generation to chains written in any
// language.
//
// Usage:
//
//	proofsheet profile FILE... [--json]
//	proofsheet diff [--key COLS] [--tol SPEC]... [--format F] WANT GOT
//	proofsheet diff --engine duckdb|postgres://…|clickhouse://… [--key COLS] … WANT GOT
//	proofsheet changes [--base REV | --records DIR] [--format F] [PATH...]
//	proofsheet gen --schema FILE [--rows N] [--seed N] [--mess LEVEL] [--out FILE]
//	proofsheet demo [--html FILE]
//	proofsheet help [COMMAND]
//
// Exit status follows POSIX diff: 0 no difference, 1 differences, 2 trouble
// (bad input, usage).
//
// Typical use, from a chain written in Python that writes its report as
// CSV, in CI:
//
//	python daily_report.py raw/ > out/daily.csv
//	proofsheet diff --key house,day --tol '*=abs:1e-9' testdata/daily.csv out/daily.csv
//	proofsheet changes --base origin/main --format markdown --out changes.md
package main
