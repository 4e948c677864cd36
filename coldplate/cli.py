"""Command line: ``coldplate check FILE [--format text|json] [--units si|us]`` (several files side by side,
``--watch`` to re-check on each save: coldplate.commands), ``coldplate new KIND -o FILE``, ``coldplate schema``,
``coldplate report FILE -o OUT.html|OUT.md``, ``coldplate curves FILE [-o OUT.csv|OUT.json]`` and
``coldplate size FILE`` (coldplate.sizing).

Only wiring: read the file, solve, format, set the exit status.  Bad input prints
one line on stderr and exits with status 2; nothing is written half-way.

Exit status: 0 ran; 1 the physics could not be solved (one line); 2 bad input (one line naming ``[table] key``);
130 interrupted by Ctrl-C (SIGINT) and 143 stopped by SIGTERM (128 + the signal's number, as shells report a
process killed by it), one line each, with every temporary file removed.  Library warnings never reach the
terminal; ``COLDPLATE_DEBUG=1`` turns them into errors and shows the traceback of an internal fault.
"""
from __future__ import annotations

import os
import signal
import sys

EXIT_INTERRUPTED = 130  # 128 + SIGINT
EXIT_TERMINATED = 143  # 128 + SIGTERM
_STOP_WORDS = {signal.SIGINT: ("interrupted", EXIT_INTERRUPTED), signal.SIGTERM: ("terminated", EXIT_TERMINATED)}


def _stop_at_start_up(signum, frame):  # pragma: no cover - exercised in a subprocess
    """Until main() takes over, a stop signal ends at once: nothing has been read or written yet."""
    word, status = _STOP_WORDS[signum]
    os.write(2, f"coldplate: {word} while starting; nothing written\n".encode())
    os._exit(status)


#: Run as the program (``coldplate ...`` or ``python -m coldplate.cli``), not imported by other code.
_AS_PROGRAM = __name__ == "__main__" or os.path.basename(sys.argv[0]) == "coldplate"
if _AS_PROGRAM:
    for _sig in _STOP_WORDS:
        signal.signal(_sig, _stop_at_start_up)

import argparse  # noqa: E402  (after the handlers: an interrupt during these imports is answered too)
import warnings  # noqa: E402

from coldplate.design.errors import ColdplateError, DesignError, one_line  # noqa: E402


class Terminated(BaseException):
    """SIGTERM, raised like KeyboardInterrupt so every ``finally`` (temporary files) runs on the way out."""


#: Stop signals received since main() took over.  A signal that lands inside a C extension's import comes out as
#: that import's own error ("ImportError: initialization failed"), not as the exception the handler raised: the
#: record lets main() still answer it as the stop it was.
_received: list[int] = []


def _raise_terminated(signum, frame):
    _received.append(signum)
    raise Terminated()


def _raise_interrupted(signum, frame):
    _received.append(signum)
    raise KeyboardInterrupt()


def _stop_if_signalled() -> None:
    """Re-raise a stop signal that some library turned into an error of its own on the way out."""
    if _received:
        raise (Terminated() if _received[0] == signal.SIGTERM else KeyboardInterrupt()) from None


class _Parser(argparse.ArgumentParser):
    """Command-line mistakes in one line, like every other bad input (exit 2)."""

    def error(self, message):
        self.exit(2, f"coldplate: error: {message} (see '{self.prog} --help')\n")


def _parser() -> argparse.ArgumentParser:
    from coldplate import __version__

    p = _Parser(prog="coldplate", description="Check a water-cooled cold plate design.")
    p.add_argument("--version", action="version", version=f"coldplate {__version__}")
    sub = p.add_subparsers(dest="command", required=True)
    c = sub.add_parser("check", help="solve a design file and print the design check")
    c.add_argument("file", help="design file (TOML)")
    c.add_argument("--format", choices=("text", "json", "csv"), default="text",
                   help="output format (default: text; csv: the side-by-side table)")
    c.add_argument("--units", choices=("si", "us"), default="si",
                   help="display units of the text summary (default: si; JSON is always SI)")
    from coldplate import commands

    commands.add_check_options(c)
    c.add_argument("--map", metavar="OUT.csv", help="also write the mounting-face temperature map (x_m, y_m, T_C; "
                                                     "field model only)")
    c.add_argument("--force", action="store_true", help="replace an existing --map file")
    _confidence_option(c)
    r = sub.add_parser("report", help="write a design report: one self-contained HTML file, or Markdown")
    r.add_argument("file", help="design file (TOML)")
    r.add_argument("-o", "--output", required=True, help="report file: NAME.html, or NAME.md (figures beside it)")
    r.add_argument("--units", choices=("si", "us"), default="si", help="display units (default: si)")
    _confidence_option(r)
    _flow_range_options(r)
    r.add_argument("--force", action="store_true", help="replace existing files")
    for q in (c, r):  # the plate model (coldplate.check.MODELS)
        q.add_argument("--model", choices=("field", "network"), default=None,
                       help="plate model: field (3-D, every source placed; the default) or network (fast; the "
                            "default of --watch)")
    k = sub.add_parser("curves", help="thermal resistance and pressure drop against flow, with fitted flow curves")
    k.add_argument("file", help="design file (TOML)")
    k.add_argument("-o", "--output", help="file to write (NAME.csv or NAME.json); standard output when absent")
    k.add_argument("--format", choices=("csv", "json"), help="output format (default: from the file name, else csv)")
    _flow_range_options(k)
    k.add_argument("--force", action="store_true", help="replace an existing file")
    from coldplate.sizing.command import add_parser as add_size_parser

    add_size_parser(sub)
    commands.add_parsers(sub)
    return p


def _confidence_option(p) -> None:
    p.add_argument("--confidence", help="central probability of the uncertainty band, e.g. '90 %%' (the 5 %%-95 %% "
                                        "band; default: [uncertainty] confidence, else 90 %%); without an "
                                        "[uncertainty] table: the correlations' scatter alone")


def _confidence(args):
    """The --confidence option as a fraction, or None (a bad value: one-line DesignError)."""
    if getattr(args, "confidence", None) is None:
        return None
    from coldplate.uncertainty.reader import parse_confidence

    return parse_confidence(args.confidence, "--confidence")


def _flow_range_options(p) -> None:
    p.add_argument("--min-flow", help="lowest flow of the curves, e.g. '0.3 L/min' (default: operating flow / 4)")
    p.add_argument("--max-flow", help="highest flow of the curves (default: operating flow x 4)")
    p.add_argument("--points", type=int, default=25, help="flows on the curves (default: 25)")


def _flows(args, flow):
    """The flows for the curves: log-spaced over the asked range, with the operating flow [m^3/s]."""
    from coldplate.plate.curves import DEFAULT_SPAN, MIN_POINTS, default_flows
    from coldplate.design.units import parse_value

    if not MIN_POINTS <= args.points <= 500:
        raise DesignError("--points", f"must be between {MIN_POINTS} and 500")
    lo = parse_value(args.min_flow, "flow", "--min-flow") if args.min_flow else flow * DEFAULT_SPAN[0]
    hi = parse_value(args.max_flow, "flow", "--max-flow") if args.max_flow else flow * DEFAULT_SPAN[1]
    if not 0 < lo < hi:
        raise DesignError("--min-flow", "must be positive and below --max-flow")
    return default_flows(flow, (lo / flow, hi / flow), args.points)


def _report(args, version) -> str:
    from pathlib import Path

    from coldplate.plate.curves import fit_flow_curves, flow_curve, mounting_face_profile
    from reports.make import check_targets, make_report, remove_leftovers, report_format, write_report

    report_format(args.output)
    remove_leftovers(args.output)  # of a killed earlier run of this report
    if not args.force:
        check_targets([args.output], False)
    try:
        raw = Path(args.file).read_bytes()
    except OSError as exc:
        raise DesignError("", f"cannot read design file {args.file!r}: {exc.strerror or exc}") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise DesignError("", f"design file {args.file!r} is not UTF-8 text") from None
    result = _checked(text, _confidence(args), args.model or "field")
    curve = flow_curve(result.design, _flows(args, result.V_dot), load=result.load, flow=result.V_dot)
    rep = make_report(result, curve, fit_flow_curves(curve), mounting_face_profile(result), units=args.units,
                      version=version, source_name=Path(args.file).name, source_bytes=raw)
    written = write_report(rep, args.output, args.force)
    return "wrote " + ", ".join(str(p) for p in written)


def _checked(text: str, confidence, model: str = "field"):
    """The check of design-file text, with its uncertainty band when the file or --confidence asks for one."""
    from coldplate.design.reader import _toml
    from coldplate.uncertainty.run import check_data

    return check_data(_toml(text), confidence, model=model)


def _curves(args, version) -> str:
    from coldplate.plate.curves import fit_flow_curves, flow_curve
    from coldplate.design.reader import load_design
    from coldplate.check import solve

    fmt = args.format
    if fmt is None:
        fmt = "json" if (args.output or "").lower().endswith(".json") else "csv"
    if args.output:
        from reports.make import check_targets

        check_targets([args.output], args.force)
    design = load_design(args.file)
    here = solve(design)  # the operating point: modules set the plate's load, a supply circuit its flow
    curve = flow_curve(design, _flows(args, here.V_dot), load=here.load, flow=here.V_dot)
    fit = fit_flow_curves(curve)
    if fmt == "json":
        from reports.curves_out import render_curves_json

        text = render_curves_json(curve, fit, design.title, version)
    else:
        from reports.curves_out import render_csv

        text = render_csv(curve, fit)
    if args.output:
        from reports.make import write_atomic

        write_atomic(args.output, text if text.endswith("\n") else text + "\n")
        return f"wrote {args.output}"
    return text


def _map_target(path, force) -> None:
    """Refuse a ``--map`` target before solving: an existing file without --force, a missing folder."""
    from reports.make import check_targets

    try:
        check_targets([path], force)
    except DesignError as exc:
        raise DesignError("--map", exc.problem) from None


def _write_map(result, path) -> None:
    """``check --map``: the face map, written whole or not at all (refused for a result without a field)."""
    from reports.fieldmap import render_face_map
    from reports.make import write_atomic

    write_atomic(path, render_face_map(result))


def main(argv=None) -> int:
    debug = bool(os.environ.get("COLDPLATE_DEBUG"))
    previous = {}
    _received.clear()
    try:
        previous = {signal.SIGINT: signal.signal(signal.SIGINT, _raise_interrupted),
                    signal.SIGTERM: signal.signal(signal.SIGTERM, _raise_terminated)}
    except ValueError:  # not the main thread: signals stay as they are
        pass
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("error" if debug else "ignore")
            status = _run(argv, debug)
        if status == EXIT_INTERRUPTED:  # `size` stopped in its search: it has printed the best so far
            _end_stopped(status)
        return status
    except (KeyboardInterrupt, Terminated) as exc:
        for sig in _STOP_WORDS:  # a second Ctrl-C cannot break the one line
            signal.signal(sig, signal.SIG_IGN)
        word, status = _STOP_WORDS[signal.SIGTERM if isinstance(exc, Terminated) else signal.SIGINT]
        print(f"coldplate: {word}; nothing written", file=sys.stderr)
        _end_stopped(status)
        return status
    finally:
        for sig, handler in previous.items():
            signal.signal(sig, handler)


def _end_stopped(status: int) -> None:
    """As the program, end a stopped run here: every ``finally`` has run, and the interpreter's own exit could
    report the signal a second time (it did now and then: status -2 after our line)."""
    if _AS_PROGRAM:
        for stream in (sys.stdout, sys.stderr):
            try:
                stream.flush()
            except (OSError, ValueError):
                pass
        os._exit(status)


def _run(argv, debug: bool) -> int:
    args = _parser().parse_args(argv)
    try:
        if args.command == "size":
            from coldplate.sizing.command import run as run_size

            return run_size(args, write_stdout)
        from coldplate import __version__, commands

        if commands.wants(args):
            return commands.run(args, write_stdout, _stop_if_signalled)

        if args.command == "report":
            text = _report(args, __version__)
        elif args.command == "curves":
            text = _curves(args, __version__)
        else:
            from coldplate.uncertainty.run import check_file_with_band

            if args.map:
                _map_target(args.map, args.force)
            result = check_file_with_band(args.file, _confidence(args), model=args.model or "field")
            if args.map:
                _write_map(result, args.map)
            if args.format == "json":
                from reports.jsonout import render_json

                text = render_json(result, __version__)
            else:
                from reports.text import render_text

                text = render_text(result, __version__, units=args.units)
    except DesignError as exc:
        _stop_if_signalled()
        print(f"coldplate: error: {one_line(exc)}", file=sys.stderr)
        return 2
    except ColdplateError as exc:
        _stop_if_signalled()
        print(f"coldplate: cannot solve: {one_line(exc)}", file=sys.stderr)
        return 1
    except Exception as exc:  # an internal fault: one line unless debugging is asked for
        _stop_if_signalled()
        if debug:
            raise
        print(f"coldplate: internal error ({type(exc).__name__}: {_first_line(exc)}); set COLDPLATE_DEBUG=1 "
              "for details", file=sys.stderr)
        return 1
    return write_stdout(text)


def _first_line(exc) -> str:
    text = str(exc).strip()
    return text.splitlines()[0] if text else "no message"


def write_stdout(text: str) -> int:
    """Print the command's output; a reader that closed the pipe early (``| head``) is not an error."""
    try:
        sys.stdout.write(text if text.endswith("\n") else text + "\n")
        sys.stdout.flush()
    except BrokenPipeError:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())  # the interpreter's last flush has nowhere to fail
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
