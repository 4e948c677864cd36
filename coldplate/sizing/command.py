"""``coldplate size FILE``: wiring only (read, search, print, write), with a progress bar and Ctrl-C.

The progress bar goes to stderr, only when stderr is a terminal and ``--quiet`` is not given.  Ctrl-C stops
the search between chunks; the best design found so far is printed and the exit status is 130.
``--write-best OUT.toml`` writes the recommendation as a design file atomically (a temporary file in the same
folder, then a rename; the umask sets its permissions, as for reports) and refuses to replace an existing file
without ``--force``.  With no feasible candidate the exit status is 1 with one line on stderr naming the
limits that bind.
"""
from __future__ import annotations

import sys
import time
from pathlib import Path

from coldplate.design.errors import DesignError

EXIT_INTERRUPTED = 130


class ProgressBar:
    """A one-line bar redrawn in place on a terminal, at most ten times a second."""

    def __init__(self, stream, width: int = 30):
        self.stream, self.width = stream, width
        self.t0 = self.last = time.perf_counter()
        self.drawn = False

    def __call__(self, done: int, total: int) -> None:
        now = time.perf_counter()
        if done < total and now - self.last < 0.1:
            return
        self.last = now
        frac = done / total if total else 1.0
        filled = int(round(frac * self.width))
        self.stream.write(f"\r  sizing [{'#' * filled}{'.' * (self.width - filled)}] {frac * 100:3.0f} %  "
                          f"{done:,} / {total:,} candidates  {now - self.t0:.1f} s ")
        self.stream.flush()
        self.drawn = True

    def close(self) -> None:
        if self.drawn:
            self.stream.write("\r" + " " * (self.width + 70) + "\r")
            self.stream.flush()


def add_parser(sub) -> None:
    s = sub.add_parser("size", help="search ranges of plate sizes and flows given in [search]; recommend one")
    s.add_argument("file", help="design file (TOML) with a [search] table")
    s.add_argument("--format", choices=("text", "json", "csv"), default="text",
                   help="output format (default: text; csv: the trade-off front, one row a design)")
    s.add_argument("--write-best", metavar="OUT.toml", help="write the recommended design as a design file")
    s.add_argument("--force", action="store_true", help="let --write-best replace an existing file")
    s.add_argument("--quiet", action="store_true", help="no progress bar")


def run(args, write_stdout) -> int:
    from coldplate import __version__
    from coldplate.sizing.recommend import binding_line, read_file
    from coldplate.uncertainty.sizing import size  # the nominal search, or held at a face percentile

    out_path = Path(args.write_best) if args.write_best else None
    if out_path is not None and out_path.exists() and not args.force:
        raise DesignError("--write-best", f"{str(out_path)!r} exists; add --force to replace it")
    if out_path is not None and not out_path.resolve().parent.is_dir():  # say so before a long search
        raise DesignError("--write-best", f"directory {str(out_path.parent)!r} does not exist")
    data, design, spec = read_file(args.file)
    bar = None if args.quiet or not sys.stderr.isatty() else ProgressBar(sys.stderr)
    try:
        result = size(data, design, spec, progress=bar)
    except KeyboardInterrupt:  # outside the search itself (tables, the final check): nothing to show yet
        print("coldplate: interrupted before any design was found; nothing written", file=sys.stderr)
        return EXIT_INTERRUPTED
    finally:
        if bar is not None:
            bar.close()
    if args.format == "json":
        from reports.sizing import render_sizing_json

        text = render_sizing_json(result, __version__)
    elif args.format == "csv":
        from reports.sizing import render_sizing_csv

        text = render_sizing_csv(result)
    else:
        from reports.sizing import render_sizing_text

        text = render_sizing_text(result, __version__)
    interrupted = result.outcome.interrupted or any("interrupted" in n for n in result.notes)
    if out_path is not None and result.text is not None and not interrupted:
        _write_atomic(out_path, result.text)
    write_stdout(text)
    if interrupted:
        print("coldplate: interrupted; the best design of the part searched is shown above"
              + (" (nothing written)" if out_path else ""), file=sys.stderr)
        return EXIT_INTERRUPTED
    if result.recommended is None:  # exit 1, one line naming the limits that bind
        print(f"coldplate: cannot size: {binding_line(result.outcome)}"
              + (f"; nothing written to {out_path}" if out_path is not None else ""), file=sys.stderr)
        return 1
    if out_path is not None:
        print(f"coldplate: wrote {out_path}", file=sys.stderr)
    return 0


def _write_atomic(path: Path, text: str) -> None:
    """The recommendation as a design file, atomically, with the umask's permissions (reports.make)."""
    from reports.make import write_atomic

    try:
        write_atomic(path, text)
    except OSError as exc:
        raise DesignError("--write-best", f"cannot write {str(path)!r}: {exc.strerror or exc}") from None
