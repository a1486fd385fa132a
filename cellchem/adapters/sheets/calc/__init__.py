"""The CC_* worksheet functions in LibreOffice Calc: an extension (.oxt)
with a Calc add-in written in Python over UNO.

``component.py`` is the add-in itself (copied into the extension; it runs
inside LibreOffice's Python); ``build.py`` writes the extension: the UNO IDL
interface compiled with the SDK's ``unoidl-write``, the add-in configuration
that names the functions and their arguments in Calc's function wizard, and
the pure-Python core bundled with what it needs (pyparsing, pint and pint's
own pure-Python dependencies), so nothing is fetched at run time.
"""
