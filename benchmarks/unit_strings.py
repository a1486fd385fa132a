"""What reading unit strings through pint costs a worksheet recalculation.

Prints, in one run: the first use of pint (building its registry), a first
sight of a new unit string, a remembered unit string, and pint's own
conversion of the same unit without cellchem's memory, with the ratio of the
two. Run from the repository root after installing: python benchmarks/unit_strings.py
"""

from __future__ import annotations

import time


def per_call(fn, n: int) -> float:
    start = time.perf_counter()
    for _ in range(n):
        fn()
    return (time.perf_counter() - start) / n


def main() -> None:
    from cellchem.units import _registry, read_unit

    start = time.perf_counter()
    read_unit("mmol/L")
    first = time.perf_counter() - start
    start = time.perf_counter()
    read_unit("ug/dL")
    new = time.perf_counter() - start
    remembered = per_call(lambda: read_unit("mmol/L"), 200_000)
    ureg = _registry()
    raw = per_call(lambda: ureg.Quantity(1.0, "mmol/L").to("mol/L").magnitude, 5_000)
    print(f"first unit string (pint registry built): {first * 1e3:8.1f} ms")
    print(f"a new unit string:                       {new * 1e6:8.1f} us")
    print(f"a remembered unit string:                {remembered * 1e6:8.3f} us")
    print(f"pint conversion, not remembered:         {raw * 1e6:8.1f} us")
    print(f"ratio remembered / pint:                 {remembered / raw:8.4f}")


if __name__ == "__main__":
    main()
