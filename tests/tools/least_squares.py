"""Batch ordinary least squares with numpy, for the RLS reference test.

Usage: python3 least_squares.py DATA.csv
DATA.csv has no header; each row is x_1, ..., x_n, y. Prints the n coefficients of
numpy.linalg.lstsq(X, y), one per line, with 17 significant digits.
"""
import sys

import numpy


def main() -> None:
    data = numpy.loadtxt(sys.argv[1], delimiter=",", ndmin=2)
    coefficients, *_ = numpy.linalg.lstsq(data[:, :-1], data[:, -1], rcond=None)
    for value in coefficients:
        print(f"{value:.17g}")


if __name__ == "__main__":
    main()
