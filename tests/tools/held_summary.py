"""Sample-and-hold summaries of irregular samples with numpy, for the daily record reference test.

Usage: python3 held_summary.py SAMPLES.csv START END RATE_PER ABOVE
SAMPLES.csv has no header; each row is: series, time (s), value, usable (1 or 0), rows of one
series in time order. Each sample's value holds from its time until the series' next sample
(the last one until END): the left-held rule, not the trapezoid rule. Time is counted only in
[START, END) and only while the held sample is usable. For every series, in order, prints one
line: total (sum of value * seconds / RATE_PER), usable hours, hours above ABOVE, max, time
average (null-free: nan when there is no usable time), with 17 significant digits.
"""
import sys

import numpy


def summarise(t, v, ok, start, end, rate_per, above):
    following = numpy.append(t[1:], end)
    lo = numpy.clip(t, start, end)
    hi = numpy.clip(following, start, end)
    dt = numpy.where(ok, hi - lo, 0.0)
    total = numpy.sum(v * dt) / rate_per
    usable_s = numpy.sum(dt)
    above_s = numpy.sum(numpy.where(v > above, dt, 0.0))
    in_period = ok & (following > start) & (t < end)
    maximum = numpy.max(v[in_period]) if numpy.any(in_period) else float("nan")
    average = numpy.sum(v * dt) / usable_s if usable_s > 0 else float("nan")
    return total, usable_s / 3600.0, above_s / 3600.0, maximum, average


def main() -> None:
    data = numpy.loadtxt(sys.argv[1], delimiter=",", ndmin=2)
    start, end, rate_per, above = (float(a) for a in sys.argv[2:6])
    for series in numpy.unique(data[:, 0]):
        rows = data[data[:, 0] == series]
        figures = summarise(rows[:, 1], rows[:, 2], rows[:, 3] > 0.5, start, end, rate_per, above)
        print(" ".join(f"{x:.17g}" for x in figures))


if __name__ == "__main__":
    main()
