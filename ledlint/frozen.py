"""A read-only mapping that, unlike FrozenMap, pickles (results cross process boundaries)."""

from __future__ import annotations

from typing import Any, NoReturn


class FrozenMap(dict[Any, Any]):
    """A dict whose contents cannot change after construction."""

    def _read_only(self, *args: Any, **kwargs: Any) -> NoReturn:
        raise TypeError("this mapping is read-only")

    __setitem__ = __delitem__ = clear = pop = popitem = setdefault = update = __ior__ = _read_only

    def __reduce__(self) -> tuple[type, tuple[dict[Any, Any]]]:
        return (FrozenMap, (dict(self),))

    def __hash__(self) -> int:  # type: ignore[override]
        return hash(tuple(sorted(self.items(), key=repr)))
