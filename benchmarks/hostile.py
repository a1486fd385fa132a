"""Each hostile file of tests/hostile.py through audit and fill: seconds, peak MB
and how the command ended, one row per file and command.

    python benchmarks/hostile.py                    # every file at full size (about 1 GiB inflated each)
    python benchmarks/hostile.py --small            # the same shapes at a few kilobytes
    python benchmarks/hostile.py --only xlsx-cell-bomb,csv-large --timeout 120

Every command runs in its own process under the limits the tests set (an
address space of 1 GiB, umask 022) and is killed at --timeout seconds. The
limit column is the rule the tests hold the file to.
"""

from __future__ import annotations

import argparse
import importlib.util
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _builders():
    """tests/hostile.py, loaded under its own name (this script is also called hostile)."""
    spec = importlib.util.spec_from_file_location("hostile_files", ROOT / "tests" / "hostile.py")
    module = importlib.util.module_from_spec(spec)
    sys.modules["hostile_files"] = module
    spec.loader.exec_module(module)
    return module


def _outcome(run) -> str:
    if run.timed_out:
        return "timed out"
    if run.killed:
        return "killed"
    text = run.output
    if "Traceback" in text or "MemoryError" in text:
        kind = "MemoryError" if "MemoryError" in text else "traceback"
        return f"exit {run.code}, {kind}"
    return f"exit {run.code}"


def _message(run) -> str:
    """Why a file was not read (the summary's NOT READ line or the last line on
    standard error), else the summary's count of rows or lines."""
    out = [line.strip() for line in run.stdout.splitlines() if line.strip()]
    err = [line.strip() for line in run.stderr.splitlines() if line.strip()]
    for line in out:
        if "NOT READ" in line:
            return line[:200]
    if err:
        return err[-1][:200]
    for line in out:
        if line.startswith(("files:", "lines filled")):
            return line[:200]
    return ""


def main() -> None:
    parser = argparse.ArgumentParser(
        description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter
    )
    parser.add_argument("--small", action="store_true", help="build the small files of the same shapes")
    parser.add_argument("--only", help="comma-separated case names (default: all)")
    parser.add_argument("--timeout", type=float, default=30.0, help="seconds before a command is killed")
    parser.add_argument("--keep", metavar="DIR", help="build the files in DIR and keep them")
    args = parser.parse_args()
    hostile = _builders()
    cases = hostile.CASES
    if args.only:
        wanted = {name.strip() for name in args.only.split(",") if name.strip()}
        unknown = wanted - set(hostile.CASE)
        if unknown:
            parser.error(f"unknown cases: {', '.join(sorted(unknown))}; known: {', '.join(hostile.CASE)}")
        cases = [case for case in cases if case.name in wanted]
    lines = [
        "| file | what | on disk MB | command | seconds | limit s | peak MB | outcome | message |",
        "| --- | --- | ---: | --- | ---: | ---: | ---: | --- | --- |",
    ]
    with tempfile.TemporaryDirectory(prefix="cellchem-hostile-") as tmp:
        base = Path(args.keep) if args.keep else Path(tmp)
        for case in cases:
            folder = base / case.name
            folder.mkdir(parents=True, exist_ok=True)
            build = case.small if args.small else case.build
            started = time.perf_counter()
            path = build(folder)
            built = time.perf_counter() - started
            size_mb = path.stat().st_size / 1e6
            for command, argv in hostile.commands(case, path, folder / "out").items():
                out = folder / "out"
                shutil.rmtree(out, ignore_errors=True)
                out.mkdir()
                run = hostile.run_cellchem(argv, timeout=args.timeout)
                lines.append(
                    f"| {case.name} | {case.what} | {size_mb:.1f} | {command} | {run.seconds:.1f} |"
                    f" {case.seconds:.0f} | {run.peak_mb:.0f} | {_outcome(run)} |"
                    f" {_message(run).replace('|', '/')} |"
                )
                print(lines[-1], file=sys.stderr, flush=True)
                shutil.rmtree(out, ignore_errors=True)
            if not args.keep:
                shutil.rmtree(folder, ignore_errors=True)
            print(f"  ({case.name} built in {built:.1f} s)", file=sys.stderr, flush=True)
    print("\n".join(lines))
    print(f"\n(each command in its own process: address space {hostile.MEMORY_BYTES >> 20} MB, umask 022)")


if __name__ == "__main__":
    main()
