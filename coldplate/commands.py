"""The working-day commands: ``coldplate new``, ``coldplate schema``, ``coldplate check`` on several files
(side by side) and ``coldplate check FILE --watch`` (a live re-check while editing).

Wiring only, like :mod:`coldplate.cli` (which registers these parsers and hands the parsed arguments here):
read, solve, hand the results to :mod:`reports.compare`, write.  Each command is one function, so options
other commands gain merge without touching these.
"""
from __future__ import annotations

import os
import sys
import threading
import time
from pathlib import Path

from coldplate.design.errors import ColdplateError, DesignError, one_line

EXIT_INTERRUPTED = 130
#: How often the watch mode looks at the file [s].  Polling the file's status (modification time in
#: nanoseconds, size, inode) rather than a file-watching library: one ``os.stat`` four times a second costs
#: nothing next to a solve, needs no dependency and no platform back-end, sees an editor's save by rename
#: (a new inode) as well as one in place, and works the same on network and container file systems where
#: change notifications are not delivered.
POLL_SECONDS = 0.25


def add_parsers(sub) -> None:
    """``new`` and ``schema``; the ``check`` options for several files and ``--watch`` are in
    :func:`add_check_options`."""
    from coldplate.design.starters import KINDS

    n = sub.add_parser("new", help="write a complete, commented design file to start from")
    n.add_argument("kind", choices=KINDS, help="the kind of design: " + ", ".join(KINDS))
    n.add_argument("-o", "--output", required=True, help="design file to write (NAME.toml)")
    n.add_argument("--force", action="store_true", help="replace an existing file")
    s = sub.add_parser("schema", help="print the design file's JSON Schema, for editors that check TOML")
    s.add_argument("-o", "--output", help="file to write; standard output when absent")
    s.add_argument("--force", action="store_true", help="replace an existing file")


def add_check_options(c) -> None:
    c.add_argument("more", nargs="*", default=[], metavar="FILE", help="more design files: compared side by side")
    c.add_argument("--watch", action="store_true",
                   help="check again each time the file is saved, showing what changed (Ctrl-C ends)")


def wants(args) -> bool:
    """Whether these arguments are one of this module's commands."""
    return args.command in ("new", "schema") or (
        args.command == "check" and bool(args.more or args.watch or args.format == "csv"))


#: Called where one design's failure is caught, so a stop signal that a library turned into an error of its own
#: still stops the command (``cli`` sets it to its ``_stop_if_signalled``; this module cannot import cli).
_reraise_stop = None


def run(args, write_stdout, reraise_stop=None) -> int:
    global _reraise_stop
    _reraise_stop = reraise_stop
    if args.command == "new":
        return _new(args)
    if args.command == "schema":
        return _schema(args, write_stdout)
    if args.watch:
        return watch_command(args)
    return compare_command(args, write_stdout)


def _write(path: str, text: str, force: bool, key: str) -> None:
    from reports.make import check_targets, write_atomic

    check_targets([path], force)
    try:
        write_atomic(path, text)
    except OSError as exc:
        raise DesignError(key, f"cannot write {path!r}: {exc.strerror or exc}") from None


def _new(args) -> int:
    from coldplate.design.starters import starter_text

    _write(args.output, starter_text(args.kind), args.force, "-o")
    print(f"coldplate: wrote {args.output} (a {args.kind} design; check it with: coldplate check {args.output})",
          file=sys.stderr)
    return 0


def _schema(args, write_stdout) -> int:
    from coldplate.design.schema import schema_text

    text = schema_text()
    if args.output:
        _write(args.output, text, args.force, "-o")
        print(f"coldplate: wrote {args.output}", file=sys.stderr)
        return 0
    return write_stdout(text)


# ---------------------------------------------------------------- several designs


def _names(files) -> list[str]:
    """Column names: the file names, or the paths as given where two files share a name."""
    base = [Path(f).name for f in files]
    return [b if base.count(b) == 1 else f for b, f in zip(base, files)]


def check_one(path, model: str = "field"):
    """(result, None) or (None, (exit status, the one line saying why)) for one design file."""
    from coldplate.check import check_file

    try:
        return check_file(path, model=model), None
    except DesignError as exc:
        return None, _failed(2, f"error: {one_line(exc)}")
    except ColdplateError as exc:
        return None, _failed(1, f"cannot solve: {one_line(exc)}")
    except Exception as exc:  # an internal fault of one design: the others still run
        if os.environ.get("COLDPLATE_DEBUG"):
            raise
        return None, _failed(1, f"internal error ({type(exc).__name__}: {one_line(exc)})")


def _failed(status: int, line: str) -> tuple[int, str]:
    if _reraise_stop is not None:  # the "error" was a stop signal in disguise: stop, do not go on
        _reraise_stop()
    return status, line


def compare_command(args, write_stdout) -> int:
    """``coldplate check A.toml B.toml ...``: every design solved, one table; 2 if any failed to read, else 1
    if any could not be solved."""
    from coldplate import __version__
    from coldplate.findings.base import SEVERITIES
    from reports.compare import Column, render_comparison_csv, render_comparison_json, render_comparison_text

    if getattr(args, "map", None):
        raise DesignError("--map", "writes the map of one design; check one file with it")
    files = [args.file, *args.more]
    columns, worst = [], 0
    for name, path in zip(_names(files), files):
        result, failed = check_one(path, args.model or "field")
        if failed:
            status, line = failed
            worst = max(worst, status)
            print(f"coldplate: {name}: {line}", file=sys.stderr)
            columns.append(Column(name, error=line))
        else:
            columns.append(Column(name, result))
    if args.format == "json":
        text = render_comparison_json(columns, __version__)
    elif args.format == "csv":
        text = render_comparison_csv(columns, SEVERITIES)
    else:
        text = render_comparison_text(columns, SEVERITIES, args.units)
    write_stdout(text)
    return 2 if worst == 2 else worst


# ---------------------------------------------------------------- watch


def signature(path) -> tuple | None:
    """What says a file changed: (modification time [ns], size, inode), or None while it is missing."""
    try:
        st = os.stat(path)
    except OSError:
        return None
    return st.st_mtime_ns, st.st_size, st.st_ino


#: The plate model of a live re-check unless --model says otherwise: the network answers in tens of milliseconds,
#: so a save shows its effect at once; the field (about a second a solve on the examples) is asked for with
#: ``--model field``.  The first line of the watch says which model it runs.
WATCH_MODEL = "network"


def watch(path, emit, *, units: str = "si", stop: threading.Event | None = None,
          poll: float = POLL_SECONDS, on_solved=None, model: str = WATCH_MODEL) -> None:
    """Check ``path`` now and after each save until ``stop`` is set (or Ctrl-C): ``emit(line)`` for every line
    shown; ``on_solved(result or None)`` after each attempt (tests and benchmarks listen there)."""
    from coldplate.findings.base import SEVERITIES
    from reports.compare import changes, counts
    from reports.text import render_text
    from coldplate import __version__

    last_sig, last = object(), None
    stop = stop or threading.Event()
    while not stop.is_set():
        sig = signature(path)
        if sig != last_sig:
            last_sig = sig
            start = time.perf_counter()
            result, failed = check_one(path, model) if sig is not None else (None, (2, f"error: {path} is missing"))
            took = time.perf_counter() - start
            if failed:
                emit(f"coldplate: {failed[1]}")
                emit("coldplate: waiting for the next save")
            elif last is None:
                for line in render_text(result, __version__, units=units).rstrip("\n").splitlines():
                    emit(line)
                emit(f"coldplate: watching {path} ({model} model); checked in {took:.2f} s; Ctrl-C ends")
            else:
                found = changes(last, result, units)
                n = counts(result, SEVERITIES)
                emit(f"--- re-checked in {took:.2f} s: " + ", ".join(f"{v} {k}" for k, v in n.items() if v)
                     if any(n.values()) else f"--- re-checked in {took:.2f} s: no findings")
                for line in found or ["no change in the headline figures or the findings"]:
                    emit(f"  {line}")
            if result is not None:
                last = result
            if on_solved is not None:
                on_solved(result)
        stop.wait(poll)


def watch_command(args) -> int:
    if args.more:
        raise DesignError("--watch", "watches one design file; give one")
    if args.format != "text":
        raise DesignError("--watch", "shows text; leave out --format")
    if getattr(args, "map", None):
        raise DesignError("--map", "writes the map of one check; leave out --watch")

    def emit(line):
        sys.stdout.write(line + "\n")
        sys.stdout.flush()

    try:
        watch(args.file, emit, units=args.units, model=args.model or WATCH_MODEL)
    except KeyboardInterrupt:
        print("coldplate: stopped watching", file=sys.stderr)
        return EXIT_INTERRUPTED
    return 0  # pragma: no cover - only a stop event ends the loop otherwise
