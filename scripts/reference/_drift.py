"""Shared pieces of the reference scripts' `--check` mode: comparing a fresh run with the committed
JSON. A helper module, not a reference script (the leading underscore keeps the drift test from
running it on its own)."""
import json
import math
import os
import sys


def compare(fresh, committed, tolerance, path="", problems=None, exact_integers=False):
    """Every place where `fresh` drifts from `committed`, as a list of one-line problems.

    Numbers differ when |fresh − committed| > tolerance · max(1, |committed|); with `exact_integers`,
    whole numbers (class indices, counts) must be equal. Other values must be equal."""
    if problems is None:
        problems = []
    if isinstance(committed, dict):
        for key in committed:
            if key not in fresh:
                problems.append(f"{path}.{key}: missing in fresh run")
            else:
                compare(fresh[key], committed[key], tolerance, f"{path}.{key}", problems, exact_integers)
    elif isinstance(committed, list):
        if not isinstance(fresh, list) or len(fresh) != len(committed):
            problems.append(f"{path}: length differs")
            return problems
        for i, (a, b) in enumerate(zip(fresh, committed)):
            compare(a, b, tolerance, f"{path}[{i}]", problems, exact_integers)
    elif committed is None or fresh is None:
        if committed is not fresh:
            problems.append(f"{path}: {fresh!r} vs committed {committed!r}")
    elif isinstance(committed, (float, int)) and not isinstance(committed, bool) and not (
        exact_integers and isinstance(committed, int)
    ):
        if abs(fresh - committed) > tolerance * max(1.0, abs(committed)):
            problems.append(f"{path}: {fresh!r} vs committed {committed!r}")
    elif fresh != committed:
        problems.append(f"{path}: {fresh!r} vs committed {committed!r}")
    return problems


def numbers(value):
    """The numbers in a JSON value, in order (dictionaries by sorted key; booleans left out)."""
    if isinstance(value, bool):
        return
    if isinstance(value, (int, float)):
        yield float(value)
    elif isinstance(value, list):
        for item in value:
            yield from numbers(item)
    elif isinstance(value, dict):
        for key in sorted(value):
            yield from numbers(value[key])


def largest_difference(pairs, relative):
    """The largest difference between the numbers of each (fresh, committed) pair of JSON values:
    |fresh − committed|, divided by max(1, |committed|) when `relative`; infinite when a pair holds
    different counts of numbers."""
    worst = 0.0
    for fresh, committed in pairs:
        new, old = list(numbers(fresh)), list(numbers(committed))
        if len(new) != len(old):
            return math.inf
        for a, b in zip(new, old):
            difference = abs(a - b) / (max(1.0, abs(b)) if relative else 1.0)
            worst = max(worst, difference)
    return worst


def exit_with_check(name, worst, tolerance):
    """Prints `name: largest difference …` and exits 0 when `worst` is within `tolerance`, else 1."""
    ok = worst <= tolerance
    print(f"{name}: largest difference {worst:.2e} ({'ok' if ok else 'DIFFERS'})")
    sys.exit(0 if ok else 1)


def read_json(path):
    with open(path) as handle:
        return json.load(handle)


def write_json(path, value):
    """Writes `value` as JSON with one-space indentation and a final newline, creating the folder."""
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "w") as handle:
        json.dump(value, handle, indent=1)
        handle.write("\n")
