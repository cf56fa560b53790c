"""Command line: arguments -> API -> exit codes; nothing else.

Exit codes: 0 success; 2 the input is at fault (each message names
``Sheet!Cell`` or the file and how to fix it); 1 an internal error (one
line, plus where the full log was written).
"""

from __future__ import annotations

import argparse
import json
import sys
import traceback
from pathlib import Path

from . import __version__
from .errors import InputError
from .progress import Progress

EXIT_OK, EXIT_INTERNAL, EXIT_INPUT = 0, 1, 2


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="ranker",
        description="Rank freight corridors for heavy-duty electric truck charging, "
        "stress-test the order, and write a results workbook and a justification sheet.",
        epilog="Planning-level estimates only; confirm grid capacity with the utility; design "
        "and installation follow local codes and licensed engineers.",
    )
    p.add_argument("--version", action="version", version=f"ranker {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")

    t = sub.add_parser("template", help="write the blank input workbook")
    t.add_argument("path", type=Path, metavar="PATH.xlsx")
    t.add_argument(
        "--from",
        dest="network",
        type=Path,
        default=None,
        metavar="NETWORK.geojson",
        help="pre-fill Corridors and Places from a GIS file of corridor lines (GeoJSON; "
        "Shapefile or GeoPackage with the gis extra)",
    )
    t.add_argument(
        "--id-property",
        default=None,
        metavar="NAME",
        help="with --from: the property holding each corridor's id (default corridor_id, "
        "id or code)",
    )
    t.add_argument(
        "--name-property",
        default=None,
        metavar="NAME",
        help="with --from: the property holding each corridor's name (default name, "
        "corridor or label)",
    )

    d = sub.add_parser("demo", help="write the invented demo scenario and run it")
    d.add_argument("--out", type=Path, default=Path("."), metavar="DIR")

    c = sub.add_parser("check", help="validate an input workbook; print every problem")
    c.add_argument("input", type=Path, metavar="INPUT.xlsx")

    r = sub.add_parser("run", help="rank the corridors and write the outputs")
    r.add_argument(
        "input",
        type=Path,
        metavar="INPUT.xlsx",
        help="the input workbook (writes INPUT-ranked.xlsx and .html), or a results workbook "
        "ranker wrote (refreshed in place, keeping your edits)",
    )
    r.add_argument(
        "--out",
        type=Path,
        default=None,
        metavar="DIR",
        help="output folder, created when missing (default: the input's folder)",
    )
    r.add_argument(
        "--weights",
        default=None,
        metavar="SET",
        help="weight set by name (default: the first set)",
    )
    r.add_argument(
        "--weight",
        action="append",
        default=[],
        metavar="KEY=SHARE",
        help="set one criterion's final share of the weight in percent (40 or 40%%); the "
        "others keep their proportions (repeatable, one per criterion)",
    )
    r.add_argument(
        "--samples",
        type=int,
        default=None,
        metavar="N",
        help="Monte Carlo samples (default 10000; 0 turns it off)",
    )
    r.add_argument("--seed", type=int, default=None, metavar="N", help="random seed")
    r.add_argument("--json", action="store_true", help="print the JSON summary on stdout only")
    r.add_argument("--quiet", action="store_true", help="print nothing but errors")
    r.add_argument(
        "--watch", action="store_true", help="re-run whenever the input is saved (Ctrl-C ends)"
    )
    return p


def _err(*lines: str) -> None:
    for line in lines:
        print(line, file=sys.stderr)


def parse_overrides(pairs: list[str]) -> dict[str, float]:
    """Parse ``KEY=SHARE`` pairs of ``--weight`` into shares in percent; see parse_shares."""
    from .score.override import parse_shares

    return parse_shares(pairs)


def cmd_template(args) -> int:
    from .files import make_out_dir, os_error, shown
    from .workbook.template import write_template

    path: Path = args.path
    if path.suffix.lower() != ".xlsx":
        raise InputError.one(
            shown(path), "the template must be an .xlsx file", "name it like inputs.xlsx"
        )
    if path.exists() or path.is_symlink():
        raise InputError.one(shown(path), "a file of this name exists", "choose a new file name")
    network = None
    if args.network is not None:  # read and check it all before anything is written
        from .geo.importer import read_network

        network = read_network(
            args.network, id_property=args.id_property, name_property=args.name_property
        )
    elif args.id_property or args.name_property:
        raise InputError.one(
            "--id-property", "needs --from", "add --from NETWORK.geojson, or drop the option"
        )
    make_out_dir(path.parent, flag="the template's path")
    try:
        write_template(path, network=network)
    except OSError as exc:
        raise os_error(exc, path) from exc
    path = shown(path)
    if network is not None:
        print(
            f"Wrote the input template to {path} with {len(network.corridors)} corridors and "
            f"{len(network.places)} places from {shown(args.network)} (length_mi is each "
            "line's geodesic length on WGS 84)."
        )
        for note in network.notes:
            print(f"  note: {note}")
    else:
        print(f"Wrote the input template to {path}.", end=" ")
    print(f"Fill it in, then run: ranker check {path}")
    return EXIT_OK


def cmd_check(args) -> int:
    from .pipeline import check_workbook

    summary = check_workbook(args.input)
    print(f"{args.input}: no problems found. {summary}")
    return EXIT_OK


def run_once(args, overrides: dict[str, float]):
    """Run the main job once and write the outputs; return the Result."""
    from . import rank_workbook, write_outputs
    from .result import DEFAULT_SAMPLES, DEFAULT_SEED

    samples = DEFAULT_SAMPLES if args.samples is None else args.samples
    seed = DEFAULT_SEED if args.seed is None else args.seed
    progress = Progress(not (args.quiet or args.json), samples=samples)
    try:
        progress.stage("reading the workbook")
        result = rank_workbook(
            args.input,
            weights=args.weights,
            weight_overrides=overrides,
            samples=samples,
            seed=seed,
            progress=progress,
        )
        progress.stage("writing the results workbook and the justification sheet")
        write_outputs(result, args.out)
    finally:
        progress.close()
    return result


#: Lines of each part of "what changed" printed on the terminal; the outputs hold them all.
PRINTED_CHANGES = 12


def print_ranking(result, stream=None) -> None:
    """Print the ranked order by tiers, what changed since the last run, and the outputs."""
    from .report.narrative import terminal_lines

    stream = stream or sys.stdout
    for line in terminal_lines(result):
        print(line, file=stream)
    if result.changes:
        from .changes import describe

        previous = result.change_record.get("previous")
        print(f"What changed since the last run ({previous}):", file=stream)
        for line in describe(result.change_record, limit=PRINTED_CHANGES):
            print(f"  {line}", file=stream)
    for w in result.warnings:
        print(f"warning: {w}", file=sys.stderr)
    print(f"Results workbook: {result.outputs['workbook']}", file=stream)
    print(f"Justification sheet: {result.outputs['html']}", file=stream)
    if "geojson" in result.outputs:
        print(f"Corridors for GIS (GeoJSON): {result.outputs['geojson']}", file=stream)


def cmd_run(args) -> int:
    from .files import check_out_dir

    overrides = parse_overrides(args.weight)
    if args.out is not None:
        check_out_dir(args.out)
    if args.watch:
        from .watch import watch

        return watch(args, overrides, run_once)
    result = run_once(args, overrides)
    if args.json:
        json.dump(result.to_json(), sys.stdout, indent=2)
        sys.stdout.write("\n")
    elif not args.quiet:
        print_ranking(result)
    return EXIT_OK


def cmd_demo(args) -> int:
    from .demo import write_demo
    from .files import make_out_dir, os_error

    out: Path = args.out
    make_out_dir(out)
    try:
        path = write_demo(out)
    except OSError as exc:
        raise os_error(exc, out) from exc
    run_args = argparse.Namespace(
        input=path,
        out=out,
        weights=None,
        weight=[],
        samples=None,
        seed=None,
        json=False,
        quiet=False,
        watch=False,
    )
    from .files import shown

    print_ranking(run_once(run_args, {}))
    print(f"Demo input workbook: {shown(path)}")
    return EXIT_OK


COMMANDS = {"template": cmd_template, "check": cmd_check, "run": cmd_run, "demo": cmd_demo}


def _safe_streams() -> None:
    """Make standard output and error safe to write: present, and never an encoding error.

    A closed standard output (``ranker run x >&-``) becomes a sink; a file
    name that is not valid UTF-8 prints with its odd bytes escaped.
    """
    import os

    for name in ("stdout", "stderr"):
        stream = getattr(sys, name)
        if stream is None:
            setattr(sys, name, open(os.devnull, "w", encoding="utf-8"))  # noqa: SIM115
        elif hasattr(stream, "reconfigure"):
            try:
                stream.reconfigure(errors="backslashreplace")
            except (OSError, ValueError):
                pass


def _quiet_pipe() -> None:
    """After a broken pipe, send further output nowhere (``ranker run --json | head``)."""
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):
        pass


#: The linear-algebra library's thread count unless the user sets it [threads].
BLAS_THREADS = "1"


def main(argv: list[str] | None = None) -> int:
    """Run the command line; return the exit code.

    The analyses' matrix products are thin (a few criteria wide) and
    chunked to stay in the cache, so the linear-algebra library's own
    threads gain nothing and, spinning on a machine busy with other work,
    cost a quarter to a third of a whole run (``bench/e2e.py``). The command
    line therefore asks for one thread (``OPENBLAS_NUM_THREADS``), unless
    it is already set; numpy is not loaded yet at this point.
    """
    import os
    import warnings

    os.environ.setdefault("OPENBLAS_NUM_THREADS", BLAS_THREADS)

    with warnings.catch_warnings():
        if argv is None:  # the real command line: a library's warning as one plain line
            warnings.showwarning = _plain_warning
        try:
            return _main(argv)
        finally:
            if argv is None:  # a late Ctrl-C ends the process without a traceback
                import signal

                signal.signal(signal.SIGINT, signal.SIG_DFL)
                _skip_last_collection()


def _skip_last_collection() -> None:
    """Leave every object out of the garbage collector's pass at interpreter exit.

    The process ends next. Its last collection walks every object still
    alive (pandas, numpy and openpyxl leave hundreds of thousands) and frees
    nothing the end of the process does not (``gc.freeze``, Python 3.7+;
    finalizers registered with ``atexit`` and ``weakref.finalize`` still
    run). On the project's shared 2-core machine the exit of a demo run or
    check took 0.19-0.29 s without this and 0.03-0.04 s with it at one hour,
    and 0.02-0.04 s either way at another (the machine's memory state); an
    interpreter that has only imported those libraries exits 0.1 s sooner
    with it. Every output file is written, closed and renamed into place
    before this point.
    """
    import gc

    gc.freeze()


def _plain_warning(message, category, filename, lineno, file=None, line=None) -> None:
    """Print a library's warning without its source path and line."""
    _err(f"warning: {category.__name__}: {message}")


def _main(argv: list[str] | None) -> int:
    from .crash import Terminated, stop_on_sigterm, write_error_log

    _safe_streams()
    args = _parser().parse_args(argv)
    try:
        with stop_on_sigterm():  # a kill unwinds like Ctrl-C: no temporary file is left
            code = COMMANDS[args.command](args)
            sys.stdout.flush()
            return code
    except BrokenPipeError:
        # The reader went away (``| head``): the outputs are written; nothing to report.
        _quiet_pipe()
        return EXIT_OK
    except InputError as exc:
        _err(*(str(p) for p in exc.problems))
        _err(f"{len(exc.problems)} problem(s) found; nothing was written.")
        return EXIT_INPUT
    except KeyboardInterrupt:
        _err("Stopped.")
        return 130
    except Terminated:
        _err("Stopped (terminated).")
        return 143
    except Exception as exc:  # the one place every other failure is caught
        log = write_error_log(traceback.format_exc())
        where = f"full log in {log}" if log is not None else "no log could be written"
        _err(f"ranker: internal error: {type(exc).__name__}: {exc} ({where})")
        return EXIT_INTERNAL


if __name__ == "__main__":
    raise SystemExit(main())
