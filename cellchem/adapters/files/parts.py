"""What the two package readers (``xlsx`` and ``ods``) share: the safe XML
parser for a part of a user's file, and a sheet as the workbook lists it."""

from __future__ import annotations

from dataclasses import dataclass
from xml.parsers import expat

CHUNK = 1 << 16  # bytes read from a part at a time, and expat's text buffer


def _forbid_doctype(*_args: object) -> None:
    from defusedxml import DTDForbidden

    raise DTDForbidden(None, None, None)


def _forbid_entity(*_args: object) -> None:
    from defusedxml import EntitiesForbidden

    raise EntitiesForbidden(None, None, None, None, None, None)


def _forbid_external(*_args: object) -> None:
    from defusedxml import ExternalReferenceForbidden

    raise ExternalReferenceForbidden(None, None, None, None)


def safe_parser(separator: str | None) -> expat.XMLParserType:
    """An expat parser that refuses what defusedxml refuses (a document type,
    entity declarations, external references), with defusedxml's exceptions.
    ``separator``: element names as namespace URI, separator, local name;
    ``None`` for names as written, with their prefixes."""
    p = expat.ParserCreate() if separator is None else expat.ParserCreate(namespace_separator=separator)
    p.StartDoctypeDeclHandler = _forbid_doctype
    p.EntityDeclHandler = _forbid_entity
    p.UnparsedEntityDeclHandler = _forbid_entity
    p.ExternalEntityRefHandler = _forbid_external
    p.buffer_text = True
    p.buffer_size = CHUNK
    return p


@dataclass(frozen=True)
class SheetInfo:
    name: str
    state: str  # "visible", "hidden" or (.xlsx) "veryHidden"
    part: str = ""  # the sheet's part in an .xlsx package
