"""Command line: ``coldplate check FILE [--format text|json]`` and ``coldplate size FILE`` (coldplate.sizing).

Only wiring: read the file, solve, format, set the exit status.  Bad input prints
one line on stderr and exits with status 2; nothing is written half-way.
"""
from __future__ import annotations

import argparse
import os
import sys

from .errors import ColdplateError, DesignError


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="coldplate", description="Check a water-cooled cold plate design.")
    sub = p.add_subparsers(dest="command", required=True)
    c = sub.add_parser("check", help="solve a design file and print the design check")
    c.add_argument("file", help="design file (TOML)")
    c.add_argument("--format", choices=("text", "json"), default="text", help="output format (default: text)")
    from .sizing.command import add_parser as add_size_parser

    add_size_parser(sub)
    return p


def main(argv=None) -> int:
    args = _parser().parse_args(argv)
    try:
        if args.command == "size":
            from .sizing.command import run as run_size

            return run_size(args)
        from . import __version__
        from .solve import check_file

        result = check_file(args.file)
        if args.format == "json":
            from reports.jsonout import render_json

            text = render_json(result, __version__)
        else:
            from reports.text import render_text

            text = render_text(result, __version__)
    except DesignError as exc:
        print(f"coldplate: error: {exc}", file=sys.stderr)
        return 2
    except ColdplateError as exc:
        print(f"coldplate: cannot solve: {exc}", file=sys.stderr)
        return 1
    except Exception as exc:  # an internal fault: one line unless debugging is asked for
        if os.environ.get("COLDPLATE_DEBUG"):
            raise
        print(f"coldplate: internal error ({type(exc).__name__}: {exc}); set COLDPLATE_DEBUG=1 for details",
              file=sys.stderr)
        return 1
    sys.stdout.write(text if text.endswith("\n") else text + "\n")
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
