#!/usr/bin/env python3
"""Counts in a wide-form history CSV, computed with Python's csv, datetime and zoneinfo modules.

Usage: csv_reference_counts.py FILE SEPARATOR ZONE [IGNORED_COLUMN...]
The first column is the time (local time in ZONE when it has no offset, fold=0). Prints
    rows <data rows>
    cells <non-empty cells outside the time and ignored columns>
    first <instant of the first row, integer microseconds since 1970-01-01T00:00Z>
    last <instant of the last row>
Used by tests/io to check the history reader on open datasets without trusting the reader.
"""
import csv
import sys
from datetime import datetime, timezone
from zoneinfo import ZoneInfo

EPOCH = datetime(1970, 1, 1, tzinfo=timezone.utc)


def micros(text, zone):
    moment = datetime.fromisoformat(text)
    if moment.tzinfo is None:
        moment = moment.replace(tzinfo=zone, fold=0)
    delta = moment - EPOCH
    return (delta.days * 86400 + delta.seconds) * 1000000 + delta.microseconds


def main():
    path, separator, zone_name = sys.argv[1:4]
    ignored = {name.lower() for name in sys.argv[4:]}
    zone = ZoneInfo(zone_name)
    with open(path, newline="", encoding="utf-8-sig") as f:
        reader = csv.reader(f, delimiter=separator)
        header = next(reader)
        keep = [i for i, name in enumerate(header) if i > 0 and name.lower() not in ignored]
        rows = [row for row in reader if row]
    cells = sum(1 for row in rows for i in keep if row[i].strip())
    print(f"rows {len(rows)}")
    print(f"cells {cells}")
    print(f"first {micros(rows[0][0], zone)}")
    print(f"last {micros(rows[-1][0], zone)}")


if __name__ == "__main__":
    main()
