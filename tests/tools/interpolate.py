"""Piecewise-linear interpolation with numpy, for the strapping table reference test.

Usage: python3 interpolate.py TABLE.csv LEVELS.txt
TABLE.csv has no header; each row is level, volume, levels increasing. LEVELS.txt holds one level
per line. Prints one volume per level, 17 significant digits: numpy.interp inside the table;
outside it, the straight line through the two end points nearest to the level, fitted with
numpy.polyfit (numpy.interp itself holds the end values there).
"""
import sys

import numpy


def main() -> None:
    table = numpy.loadtxt(sys.argv[1], delimiter=",", ndmin=2)
    levels = numpy.loadtxt(sys.argv[2], ndmin=1)
    x, y = table[:, 0], table[:, 1]
    below = numpy.polyfit(x[:2], y[:2], 1)
    above = numpy.polyfit(x[-2:], y[-2:], 1)
    for level in levels:
        if level < x[0]:
            value = numpy.polyval(below, level)
        elif level > x[-1]:
            value = numpy.polyval(above, level)
        else:
            value = numpy.interp(level, x, y)
        print(f"{value:.17g}")


if __name__ == "__main__":
    main()
