#!/usr/bin/env python3
"""Reference instants for timestamp text, computed with Python's standard library only.

Usage: iso_time_reference.py ZONE [TEXT...]   (without TEXT arguments, one TEXT per stdin line)
Prints one line per TEXT: "<micros> <kind>", where micros is the instant as integer
microseconds since 1970-01-01T00:00Z and kind is "offset" (the text had one), or, for a local
time read in ZONE with zoneinfo and fold=0 (PEP 495), "unique", "ambiguous" (a repeated hour:
fold=0 is the earlier instant) or "nonexistent" (a skipped hour: fold=0 uses the offset before
the change). Prints "error" when datetime.fromisoformat rejects the text. Used by tests/io to
check brinewatch's own ISO 8601 parser and time-zone conversion against code it did not write.
"""
import sys
from datetime import datetime, timezone
from zoneinfo import ZoneInfo

EPOCH = datetime(1970, 1, 1, tzinfo=timezone.utc)


def local_kind(naive, zone):
    earlier = naive.replace(tzinfo=zone, fold=0)
    later = naive.replace(tzinfo=zone, fold=1)
    if earlier.utcoffset() == later.utcoffset():
        return "unique"
    round_trip = earlier.astimezone(timezone.utc).astimezone(zone).replace(tzinfo=None)
    return "ambiguous" if round_trip == naive else "nonexistent"


def describe(text, zone):
    try:
        moment = datetime.fromisoformat(text)
    except ValueError:
        return "error"
    kind = "offset"
    if moment.tzinfo is None:
        kind = local_kind(moment, zone)
        moment = moment.replace(tzinfo=zone, fold=0)
    delta = moment - EPOCH
    micros = (delta.days * 86400 + delta.seconds) * 1000000 + delta.microseconds
    return f"{micros} {kind}"


def main():
    zone = ZoneInfo(sys.argv[1])
    texts = sys.argv[2:] or [line.rstrip("\n") for line in sys.stdin]
    sys.stdout.write("".join(describe(text, zone) + "\n" for text in texts))


if __name__ == "__main__":
    main()
