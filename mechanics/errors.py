"""The one exception the mechanics layer raises for input a user must correct."""


class InputError(ValueError):
    """Bad input: the message names where (file, key, row) and what would be right."""
