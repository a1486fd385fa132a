# tests/calc/driver.py runs in LibreOffice's Python (it imports uno), never under pytest
collect_ignore = ["calc/driver.py"]
