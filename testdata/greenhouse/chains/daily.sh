#!/bin/sh
# The daily table of greenhouse logger uploads, with POSIX sh and awk:
#
#     sh daily.sh UPLOAD.csv DAILY.csv
#     sh daily.sh UPLOADS/ DAILY.csv      every *.csv in the folder
#
# The same table as daily.py (see daily.awk for what it reads).
set -eu
if [ $# -ne 2 ]; then
	echo "usage: daily.sh UPLOAD.csv|UPLOADS/ DAILY.csv" >&2
	exit 2
fi
here=$(dirname "$0")
in=$1
out=$2
rows="$out.rows"
run_awk() {
	awk -v planted_bug="${PLANTED_BUG:-0}" -f "$here/daily.awk" "$@" > "$rows"
}
if [ -d "$in" ]; then
	status=0
	run_awk "$in"/*.csv || status=$?
else
	status=0
	run_awk "$in" || status=$?
fi
if [ "$status" -ne 0 ]; then
	rm -f "$rows"
	exit 2
fi
{
	echo "house,day,tmin,tmax,tmean,kept,dropped"
	LC_ALL=C sort -t, -k1,1 -k2,2 "$rows"
} > "$out"
rm -f "$rows"
