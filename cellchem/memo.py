"""A bounded memory of results for repeated inputs (stock lists and sheet
columns repeat the same compounds). Keys tell 1, 1.0 and True apart."""

from __future__ import annotations

from collections.abc import Callable, Hashable
from typing import Generic, TypeVar

T = TypeVar("T")


def typed(*values: object) -> tuple:
    """A key in which values of different types never collide (1 == 1.0 == True)."""
    return tuple((type(v), v) for v in values)


class Memo(Generic[T]):
    """Remember up to ``size`` results; the oldest is forgotten first."""

    def __init__(self, size: int) -> None:
        self.size = size
        self._items: dict[Hashable, T] = {}

    def get(self, key: Hashable, compute: Callable[[], T]) -> T:
        try:
            return self._items[key]
        except KeyError:
            pass
        except TypeError:  # an unhashable cell value: computed, not remembered
            return compute()
        value = compute()
        if len(self._items) >= self.size:
            self._items.pop(next(iter(self._items)))
        self._items[key] = value
        return value
