// Command proofsheet gives proofsheet's powers to chains written in any
// language: table comparison, property tests with generated mess and
// shrinking, golden files and their review, raw-file profiling and mess
// generation.
//
// Usage:
//
//	proofsheet profile FILE... [--json]
//	proofsheet diff [--key COLS] [--tol SPEC]... [--format F] WANT GOT
//	proofsheet diff --engine duckdb|postgres://…|clickhouse://… [--key COLS] … WANT GOT
//	proofsheet hammer --schema FILE --run 'CMD {in} {out}' [--check NAME[=ARG]]... [--seed N] [--keep DIR]
//	proofsheet golden [--update] [--store DIR] [--key COLS] [--tol SPEC]... FILE...
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
//	proofsheet hammer --schema uploads.schema --run 'python3 daily.py {in} {out}' \
//	    --key house,day --check same-on-plain --check order-free --junit hammer.xml
//	python3 daily.py raw/ out/daily.csv
//	proofsheet golden --junit golden.xml out/daily.csv
//	proofsheet changes --base origin/main --format markdown --out changes.md
package main
