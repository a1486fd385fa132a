"""Adapters for spreadsheet functions: cell conversions, the one function table,
and the Excel and LibreOffice Calc layers generated from it."""
