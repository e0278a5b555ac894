"""The one exception type plotwise raises on purpose."""


class PlotwiseError(ValueError):
    """Bad input: the message names the problem and what would work."""
