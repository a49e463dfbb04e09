#!/usr/bin/env python3
"""daily.py with a planted bug, for proofsheet hammer's tests.

    python3 daily_bug.py UPLOAD.csv DAILY.csv

The house name is matched without taking the blanks off its edges, so a
reading of " Kæreby" (a blank the logger's export left) belongs to no
house and is silently lost. Everything else is daily.py.
"""

import sys
import unicodedata

sys.dont_write_bytecode = True  # no __pycache__ beside the chain
import daily  # noqa: E402


def house_of(text):
    key = unicodedata.normalize("NFC", text).casefold()  # the bug: no strip
    for house in daily.HOUSES:
        if house.casefold() == key:
            return house
    return None


daily.house_of = house_of

if __name__ == "__main__":
    sys.exit(daily.main(sys.argv))
