# daily.awk — the daily table of one greenhouse logger upload, in POSIX awk.
# Run it through daily.sh, which sorts the rows; the variable planted_bug=1
# turns on the bug daily_bug.sh plants.
#
# Reads the uploads as the loggers write them: comma-separated, a header
# naming house, logged_at and temp_c (in any order, others ignored) at the
# top of each file, no quoted fields. Writes house,day,tmin,tmax,tmean,
# kept,dropped rows without the header; the rules are those of daily.py.

function trim(s) {
	gsub("^([ \t\r]|" nbsp ")+", "", s)
	gsub("([ \t\r]|" nbsp ")+$", "", s)
	return s
}

# fold lowers a house name's case; awk's tolower knows only ASCII bytes, so
# the capitals of the network's house names are mapped by hand.
function fold(s) {
	s = tolower(s)
	gsub("\303\224", "\303\264", s) # Ô ô
	gsub("\303\206", "\303\246", s) # Æ æ
	gsub("\303\221", "\303\261", s) # Ñ ñ
	gsub("\303\230", "\303\270", s) # Ø ø
	return s
}

function isnumber(s) {
	return s ~ /^[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)$/
}

BEGIN {
	FS = ","
	nbsp = "\302\240"
	house["bellec\303\264te"] = "Bellec\303\264te"
	house["k\303\246reby"] = "K\303\246reby"
	house["pi\303\261onal"] = "Pi\303\261onal"
	house["\303\270rnely"] = "\303\230rnely"
	datetime = "^[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9][T ][0-9][0-9]:[0-9][0-9]:[0-9][0-9]$"
}

FNR == 1 {
	sub("^\357\273\277", "") # a byte order mark
	split("", col)
	for (i = 1; i <= NF; i++) col[trim($i)] = i
	if (!("house" in col) || !("logged_at" in col) || !("temp_c" in col)) {
		print "daily.awk: " FILENAME ": the header lacks house, logged_at or temp_c" > "/dev/stderr"
		exit 2
	}
	next
}

{
	h = fold(trim($(col["house"])))
	t = trim($(col["logged_at"]))
	if (!(h in house) || t !~ datetime) {
		unplaced++
		next
	}
	h = house[h]
	day = substr(t, 1, 10)
	key = h "," day
	if (!(key in kept)) {
		kept[key] = 0
		dropped[key] = 0
	}
	v = trim($(col["temp_c"]))
	if (planted_bug) {
		# The bug: a fault code or a null word is taken as a number, which
		# awk reads as 0.
		ok = v != "" && v + 0 != -999
	} else {
		ok = isnumber(v) && v + 0 != -999
	}
	at = h " " day "T" substr(t, 12)
	if (!ok || (at in seen)) {
		dropped[key]++
		next
	}
	seen[at] = 1
	v += 0
	if (kept[key] == 0 || v < tmin[key]) tmin[key] = v
	if (kept[key] == 0 || v > tmax[key]) tmax[key] = v
	sum[key] += v
	kept[key]++
}

END {
	if (unplaced) print "daily.awk: " unplaced " row(s) without a readable house or time" > "/dev/stderr"
	for (key in kept) {
		if (kept[key] > 0)
			printf "%s,%.1f,%.1f,%.6f,%d,%d\n", key, tmin[key], tmax[key], sum[key] / kept[key], kept[key], dropped[key]
		else
			printf "%s,,,,%d,%d\n", key, kept[key], dropped[key]
	}
}
