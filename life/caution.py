"""The caution every output of flexcycle carries: in a module of its own, light to import (the command's help shows it)."""

CAUTION = (
    "Estimates, not certification: confirm by fatigue tests of prototypes, apply environmental knock-downs "
    "(moisture, temperature, UV), and let local codes and licensed engineering practice decide. "
    "A flexing part that fails releases its stored energy suddenly."
)
