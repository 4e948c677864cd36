"""The project's typed error tree.

``ColdplateError``
    ├── ``DesignError``   bad input: a field is missing, of the wrong kind, out of range.
    │                     The command line prints it on one line and exits with status 2.
    │   └── ``StateError`` the coolant would not be liquid (frozen, boiling) at the given state.
    └── ``SolveError``    the physics could not be solved (no convergence); exit status 1.
"""
from __future__ import annotations


class ColdplateError(Exception):
    """Base of every error this project raises on purpose."""


class DesignError(ColdplateError, ValueError):
    """Bad input, always naming the field (``[table] key``) and the problem."""

    def __init__(self, field: str, problem: str):
        self.field = field
        self.problem = problem
        super().__init__(f"{field}: {problem}" if field else problem)


class StateError(DesignError):
    """The coolant is not a liquid at the state the design asks for."""


class SolveError(ColdplateError, RuntimeError):
    """The solve did not converge; the message says what was tried."""


def one_line(exc) -> str:
    """An error's message on one line (a library's message may hold line breaks)."""
    return " ".join(str(exc).split())
