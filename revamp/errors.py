"""The one error type of the package, and a warning category.

Every bad input raises :class:`InputError`, which names the field path, the value given and what is allowed,
so that a user reading one line knows what to fix.
"""
from __future__ import annotations

__all__ = ["InputError", "RangeWarning", "describe_value", "printable"]


def printable(text: str, limit: int = 200) -> str:
    """``text`` safe to print on a terminal or write to a file.

    Parameters
    ----------
    text : str
        Any text (anything else is turned into one with ``str``).
    limit : int
        The most characters kept [-]; a longer text is cut and ends with ``...``.

    Returns
    -------
    str
        The text with control characters (terminal escapes, NUL), lone surrogates and other unprintable
        characters shown as ``\\x1b``-style escapes: it prints as one line and always encodes as UTF-8.

    Examples
    --------
    >>> printable("E-1\\x1b[31m")
    'E-1\\\\x1b[31m'
    """
    if not isinstance(text, str):
        text = str(text)
    if len(text) > limit:
        text = text[: limit - 3] + "..."
    if text.isprintable():
        return text
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


def describe_value(value, limit: int = 60) -> str:
    """A short printable form of a user value for an error message."""
    try:
        import numpy as np

        if isinstance(value, np.ndarray):
            if value.size == 1:
                return repr(value.item())
            return f"array(shape={value.shape}, min={np.nanmin(value):.6g}, max={np.nanmax(value):.6g})"
    except Exception:  # pragma: no cover - describing must never fail
        pass
    text = repr(value)
    return text if len(text) <= limit else text[: limit - 3] + "..."


class InputError(ValueError):
    """A bad input: names the field, the value and what is allowed.

    Parameters
    ----------
    field : str
        Path of the field, e.g. ``"exchangers[2].tube_side.flow"`` or ``"tube_od"``.
    value : object
        The value that was given.
    allowed : str
        What is allowed, in words, e.g. ``"a length > 0 (m, or a string with a unit)"``.

    Examples
    --------
    >>> err = InputError("tube_od", -1.0, "a length > 0")
    >>> str(err)
    'tube_od: -1.0: must be a length > 0'
    """

    def __init__(self, field: str, value, allowed: str):
        self.field = field
        self.value = value
        self.allowed = allowed
        shown = printable(value) if isinstance(value, str) else describe_value(value)
        super().__init__(f"{field}: {shown}: must be {allowed}")

    def with_prefix(self, prefix: str) -> "InputError":
        """The same error with a parent path in front (``prefix.field``)."""
        field = f"{prefix}.{self.field}" if self.field else prefix
        return InputError(field, self.value, self.allowed)


class RangeWarning(UserWarning):
    """A correlation or a property table used outside its stated validity range."""
