"""The version, in a module of its own: modules that `coldplate/__init__` imports read it here without an import
cycle (`coldplate` re-exports it)."""
__version__ = "0.1.0"
