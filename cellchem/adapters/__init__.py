"""Adapters: the only place spreadsheet libraries (openpyxl, xlwings) are imported.

Each adapter converts values at the edge and calls the pure core; no chemistry
lives here.
"""
