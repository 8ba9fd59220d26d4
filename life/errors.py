"""The one exception the life layer raises for input a user must correct."""


class InputError(ValueError):
    """Bad input to the life layer: the message names where (file, key, row) and what would be right."""
