#!/usr/bin/env python3
"""The daily table of greenhouse logger uploads.

    python3 daily.py UPLOAD.csv DAILY.csv
    python3 daily.py UPLOADS/ DAILY.csv      every *.csv in the folder

An upload is a datalogger's CSV file with the columns house, logged_at and
temp_c (others are ignored). DAILY.csv gets one row per house and day:

    house, day, tmin, tmax, tmean, kept, dropped

A reading is kept when its temperature is a number and not a sensor fault
(-999 or ERR). It is dropped when the temperature is missing (empty, NA,
n/a, -) or a fault, or when it repeats an earlier reading of the same house
at the same second (a re-upload). Rows whose house or time cannot be read
are counted nowhere and reported on stderr. tmin and tmax have one decimal,
tmean six; they are empty on a day whose readings were all dropped.

Python 3 and its standard library only.
"""

import csv
import os
import sys
import unicodedata
from datetime import datetime

HOUSES = ["Bellecôte", "Kæreby", "Piñonal", "Ørnely"]
FAULTS = {"-999", "ERR"}
MISSING = {"", "NA", "n/a", "-"}


def plain(text):
    """The text without blanks at its edges (any Unicode white space)."""
    return text.strip()


def house_of(text):
    """The house a cell names, whatever its case and blanks, or None."""
    key = unicodedata.normalize("NFC", plain(text)).casefold()
    for house in HOUSES:
        if house.casefold() == key:
            return house
    return None


def time_of(text):
    """The reading's time, written 2026-04-05T13:26:52 or with a blank."""
    try:
        return datetime.strptime(plain(text).replace(" ", "T", 1), "%Y-%m-%dT%H:%M:%S")
    except ValueError:
        return None


def temperature_of(text):
    """The temperature in °C, or None for a missing value or a fault."""
    text = plain(text)
    if text in MISSING or text in FAULTS:
        return None
    try:
        value = float(text)
    except ValueError:
        return None
    if value == -999:
        return None
    return value


def daily(rows):
    """The daily table (a list of dicts) of the upload's rows."""
    days = {}
    seen = set()
    unplaced = 0
    for row in rows:
        house, at = house_of(row.get("house") or ""), time_of(row.get("logged_at") or "")
        if house is None or at is None:
            unplaced += 1
            continue
        day = days.setdefault((house, at.date().isoformat()), {"temps": [], "dropped": 0})
        temp = temperature_of(row.get("temp_c") or "")
        if (house, at) in seen or temp is None:
            day["dropped"] += 1
            continue
        seen.add((house, at))
        day["temps"].append(temp)
    if unplaced:
        print(f"daily.py: {unplaced} row(s) without a readable house or time", file=sys.stderr)
    out = []
    for (house, day), d in sorted(days.items()):
        temps = d["temps"]
        out.append({
            "house": house,
            "day": day,
            "tmin": f"{min(temps):.1f}" if temps else "",
            "tmax": f"{max(temps):.1f}" if temps else "",
            "tmean": f"{sum(temps) / len(temps):.6f}" if temps else "",
            "kept": len(temps),
            "dropped": d["dropped"],
        })
    return out


def read_upload(path):
    """The upload's rows as dicts keyed by the header's plain names."""
    with open(path, newline="", encoding="utf-8-sig") as f:
        reader = csv.reader(f)
        header = [plain(name) for name in next(reader, [])]
        return [dict(zip(header, cells)) for cells in reader]


def read_uploads(path):
    """The rows of an upload, or of every upload in a folder (in name order)."""
    if not os.path.isdir(path):
        return read_upload(path)
    rows = []
    for name in sorted(os.listdir(path)):
        if name.endswith(".csv"):
            rows.extend(read_upload(os.path.join(path, name)))
    return rows


def main(argv):
    if len(argv) != 3:
        print("usage: daily.py UPLOAD.csv|UPLOADS/ DAILY.csv", file=sys.stderr)
        return 2
    table = daily(read_uploads(argv[1]))
    with open(argv[2], "w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, ["house", "day", "tmin", "tmax", "tmean", "kept", "dropped"], lineterminator="\n")
        writer.writeheader()
        writer.writerows(table)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
