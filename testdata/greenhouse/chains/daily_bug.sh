#!/bin/sh
# daily.sh with a planted bug, for proofsheet hammer's tests:
#
#     sh daily_bug.sh UPLOAD.csv DAILY.csv
#
# A temperature is taken as a reading whenever it is not empty and not
# -999, so ERR, NA and n/a — which awk reads as the number 0 — become
# readings of 0 °C. Everything else is daily.sh.
PLANTED_BUG=1 exec sh "$(dirname "$0")/daily.sh" "$@"
