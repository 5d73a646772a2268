"""The one error type for bad input, carrying the field it concerns."""

from __future__ import annotations


class InputError(ValueError):
    """A value the engineer entered cannot be used.

    Args:
        field: dotted name of the field, e.g. ``"restraints.weak.braces[0].at"``.
        text: the entry as typed (or ``repr`` of the value given).
        reason: what is wrong with it, in plain words.
        hint: what would be accepted, e.g. ``'did you mean 12\\'-6"?'``.

    Example:
        >>> e = InputError("length", "12 fr", "unknown unit 'fr'", "try 12 ft")
        >>> str(e)
        "length: cannot use '12 fr': unknown unit 'fr' (try 12 ft)"
    """

    def __init__(self, field: str, text: object, reason: str, hint: str | None = None):
        self.field = field
        self.text = text if isinstance(text, str) else repr(text)
        self.reason = reason
        self.hint = hint
        msg = f"{field}: cannot use '{self.text}': {reason}"
        if hint:
            msg += f" ({hint})"
        super().__init__(msg)

    def within(self, prefix: str) -> "InputError":
        """The same error with its field placed under ``prefix`` (``"section" + ".d"``)."""
        field = f"{prefix}.{self.field}" if self.field else prefix
        return InputError(field, self.text, self.reason, self.hint)


class StoreBusyError(InputError):
    """The store stayed locked by another writer past the busy timeout and bounded retries.

    Nothing was saved; the caller may try again (the app shows "not saved" with a retry, the
    command line exits 2 with this message).

    Example:
        >>> str(StoreBusyError("site.db"))
        "db: cannot use 'site.db': the store is busy (another program is writing to it) (try again in a moment)"
    """

    def __init__(self, path: str, detail: str | None = None):
        reason = "the store is busy (another program is writing to it)"
        if detail:
            reason += f": {detail}"
        super().__init__("db", path, reason, "try again in a moment")
