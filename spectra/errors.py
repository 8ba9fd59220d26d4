"""The one exception the spectra layer raises for input a user must correct."""


class InputError(ValueError):
    """Bad duty input: the message says what was wrong, where (file, line, row) and what would be right."""
