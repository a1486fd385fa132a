# stand_in/ holds a package named xlwings: pytest's --doctest-modules (pyproject.toml) would import it
# as the real xlwings and every later test would get the stand-in. test_pyodide.py runs it in
# Pyodide and in a child process only. node_modules/ and wheels/ are installed by setup.sh.
collect_ignore = ["stand_in", "node_modules", "wheels"]
