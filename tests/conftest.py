# tests/calc/driver.py runs in LibreOffice's Python (it imports uno), never under pytest
collect_ignore = ["calc/driver.py"]


def pytest_configure(config):
    # tests/test_hostile_files.py: deselect with -m "not slow" (they run by default)
    config.addinivalue_line("markers", "slow: runs cellchem on large or hostile files in child processes")
