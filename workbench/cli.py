"""The ``heatpath`` command: reports, rankings and materials without a notebook.

Commands::

    heatpath report SCENARIO -o report.html [--json OUT.json] [--csv OUT.csv] [--since OLD] [--force]
    heatpath rank SCENARIO [--format table|csv|json] [-o OUT]
    heatpath diff OLD NEW [--tolerance 1%] [--format text|json]
    heatpath materials list [--family F] [--file USER.csv] [--units SI|US]
    heatpath materials show ID [--file USER.csv] [--units SI|US]
    heatpath materials check FILE
    heatpath scenario new KIND [-o FILE] [--force]
    heatpath scenario check FILE

Exit codes: 0 ok, 2 bad input (a message on stderr naming the file, line,
column and key), 1 internal error. Tracebacks only with ``--debug``. Progress
goes to stderr (``--quiet`` silences it), results to stdout or the ``-o`` file.

``scenario check`` builds the study exactly as ``rank`` and ``report`` do, so it
refuses everything they would, with the same message.

Output files: every output of a command is checked before the first is
written. A target must be absent, or a regular file and ``--force`` given;
FIFOs, device nodes, sockets, directories and symbolic links are refused even
with ``--force`` (exit 2), as are two outputs with the same path and an output
that is the scenario file itself.

Work limits: a study larger than the scenario's limits (see
:data:`workbench.scenario.DEFAULT_LIMITS`: list entries, candidates, sweep
cells) is refused before computing, with the key's location and how to
coarsen; a ``[limits]`` table in the scenario file raises them deliberately.
"""

from __future__ import annotations

import argparse
import sys
import time
import traceback
from collections.abc import Sequence
from pathlib import Path

__all__ = ["main", "build_parser", "EXIT_OK", "EXIT_BAD_INPUT", "EXIT_INTERNAL"]

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_BAD_INPUT = 2


class _Progress:
    def __init__(self, quiet: bool):
        self.quiet = quiet
        self.t0 = time.monotonic()

    def __call__(self, message: str) -> None:
        if not self.quiet:
            print(
                f"heatpath: [{time.monotonic() - self.t0:5.1f} s] {message}…",
                file=sys.stderr,
                flush=True,
            )


def _version() -> str:
    import workbench

    return workbench.__version__


def _check_outputs(
    targets: Sequence[tuple[str, str | None]], force: bool, inputs: Sequence[str] = ()
) -> None:
    """Check every output target before anything is written (see the module docstring)."""
    import os

    from workbench.scenario import check_output_path

    seen: dict[str, str] = {}
    ins = {os.path.realpath(i) for i in inputs}
    for option, target in targets:
        if target is None or target == "-":
            continue
        real = os.path.realpath(target)
        if real in seen:
            raise ValueError(
                f"{option}: {target} is also the {seen[real]} output; give each output its own file"
            )
        if real in ins:
            raise ValueError(
                f"{option}: {target} is the input scenario file; choose another output name"
            )
        seen[real] = option
        check_output_path(target, force, option)


def _write_or_print(text: str, out: str | None, force: bool) -> None:
    if out is None or out == "-":
        sys.stdout.write(text)
        sys.stdout.flush()
        return
    from workbench.exports import write_text

    write_text(text, out, overwrite=force)
    print(f"heatpath: wrote {out}", file=sys.stderr)


def _text_table(rows: list[list[str]], header: list[str]) -> str:
    widths = [max(len(str(x)) for x in col) for col in zip(header, *rows, strict=True)]

    def line(cells):
        return "  ".join(str(c).ljust(w) for c, w in zip(cells, widths, strict=True)).rstrip()

    out = [line(header), line(["-" * w for w in widths])]
    out += [line(r) for r in rows]
    return "\n".join(out) + "\n"


# ---------------------------------------------------------------------------
# Commands
# ---------------------------------------------------------------------------
def _cmd_report(args) -> int:
    from workbench.exports import evaluation_to_json, results_csv, write_text
    from workbench.report import evaluate, write_report
    from workbench.scenario import load_scenario

    progress = _Progress(args.quiet)
    out = Path(args.output) if args.output else Path(args.scenario).with_suffix(".html")
    _check_outputs(
        [("-o/--output", str(out)), ("--json", args.json), ("--csv", args.csv)],
        args.force,
        [args.scenario, *([args.since] if args.since else [])],
    )
    progress(f"loading {args.scenario}")
    scenario = load_scenario(args.scenario)
    ev = evaluate(scenario, progress)
    write_report(ev, out, overwrite=args.force, progress=progress, since=args.since,
                 tolerance=args.tolerance)
    print(f"heatpath: wrote {out}", file=sys.stderr)
    if args.json:
        write_text(evaluation_to_json(ev), args.json, overwrite=args.force)
        print(f"heatpath: wrote {args.json}", file=sys.stderr)
    if args.csv:
        write_text(results_csv(ev), args.csv, overwrite=args.force)
        print(f"heatpath: wrote {args.csv}", file=sys.stderr)
    for w in ev.warnings:
        print(f"heatpath: warning: {w}", file=sys.stderr)
    return EXIT_OK


def _cmd_diff(args) -> int:
    import json

    from workbench.review import diff_files, parse_tolerance

    d = diff_files(args.old, args.new, parse_tolerance(args.tolerance))
    if args.format == "json":
        text = json.dumps(d.to_dict(), indent=2, ensure_ascii=False) + "\n"
    else:
        text = d.to_text()
    _write_or_print(text, None, False)
    return EXIT_OK


def _cmd_rank(args) -> int:
    from workbench.exports import evaluation_to_json, ranking_csv
    from workbench.report import display_frame, evaluate
    from workbench.scenario import load_scenario

    progress = _Progress(args.quiet)
    _check_outputs([("-o/--output", args.output)], args.force, [args.scenario])
    progress(f"loading {args.scenario}")
    scenario = load_scenario(args.scenario)
    ev = evaluate(scenario, progress)
    system = args.units or ev.system
    if args.format == "json":
        text = evaluation_to_json(ev)
    elif args.format == "csv":
        text = ranking_csv(ev, system)
    else:
        rk = ev.ranking.sort_values(["rank"], na_position="last")
        shown = display_frame(rk, ev.kind, system, results=ev.results)
        shown = shown.drop(columns=[c for c in shown.columns if c.startswith("Excluded")])
        rows = [[str(i), *map(str, r)] for i, r in zip(shown.index, shown.to_numpy(), strict=True)]
        text = _text_table(rows, ["candidate", *shown.columns])
        excluded = ev.ranking[~ev.ranking["feasible"]]
        for name, why in excluded["excluded_because"].items():
            text += f"excluded: {name}: {why}\n"
        if ev.chosen:
            text += f"decision: {ev.chosen}\n"
    for w in ev.warnings:
        print(f"heatpath: warning: {w}", file=sys.stderr)
    _write_or_print(text, args.output, args.force)
    return EXIT_OK


def _materials(args):
    from workbench.materials import load_materials

    return load_materials(args.file) if getattr(args, "file", None) else load_materials()


def _cmd_materials_list(args) -> int:
    from workbench import units
    from workbench.materials import FAMILIES

    m = _materials(args)
    if args.family is not None:
        if args.family not in FAMILIES:
            raise ValueError(f"--family: unknown {args.family!r}; valid: {', '.join(FAMILIES)}")
        m = m[m["family"] == args.family]
    system = args.units
    head = [
        "id",
        "name",
        "family",
        units.axis_label("conductivity", system, "k"),
        units.axis_label("density", system, "ρ"),
    ]
    rows = []
    for mid, r in m.iterrows():
        rows.append(
            [
                mid,
                r["name"],
                r["family"],
                f"{units.from_si(r['conductivity'], 'conductivity', system):.4g}",
                f"{units.from_si(r['density'], 'density', system):.4g}",
            ]
        )
    sys.stdout.write(_text_table(rows, head))
    return EXIT_OK


_SHOW = (
    ("conductivity", "conductivity", "conductivity_source"),
    ("conductivity_temperature", "temperature", "conductivity_source"),
    ("conductivity_tolerance", None, "conductivity_tolerance_source"),
    ("density", "density", "density_source"),
    ("specific_heat", "specific_heat", "specific_heat_source"),
    ("emissivity", None, "emissivity_source"),
    ("t_service_min", "temperature", "t_service_source"),
    ("t_service_max", "temperature", "t_service_source"),
)


def _cmd_materials_show(args) -> int:
    import math

    from workbench import units

    m = _materials(args)
    if args.id not in m.index:
        raise ValueError(
            f"material: unknown id {args.id!r}; see 'heatpath materials list' ({len(m)} ids)"
        )
    r = m.loc[args.id]
    out = [f"{args.id}: {r['name']}", f"  family: {r['family']} ({r['family_label']})"]
    for col, kind, src in _SHOW:
        v = float(r[col])
        if math.isnan(v):
            continue
        shown = units.format_quantity(v, kind, args.units) if kind else f"{v:g}"
        out.append(f"  {col}: {shown}    [source: {r[src]}]")
    if isinstance(r.get("cost"), float) and not math.isnan(r["cost"]):
        basis = "kg" if r["cost_basis"] == "per_kg" else "m³"
        out.append(f"  cost: {r['cost']:g} {r['currency']}/{basis}    [source: {r['cost_source']}]")
    if isinstance(r.get("emissivity_finish"), str) and r["emissivity_finish"]:
        out.append(f"  emissivity finish: {r['emissivity_finish']}")
    if isinstance(r.get("note"), str) and r["note"]:
        out.append(f"  note: {r['note']}")
    out.append(f"  origin: {r['origin']}")
    print("\n".join(out))
    return EXIT_OK


def _cmd_materials_check(args) -> int:
    from workbench.materials import check_materials_file

    problems = check_materials_file(args.file)
    if problems:
        for p in problems:
            print(p)
        print(f"heatpath: {len(problems)} problem(s) in {args.file}", file=sys.stderr)
        return EXIT_BAD_INPUT
    from workbench.materials import load_materials

    n = int((load_materials(args.file)["origin"] != "curated").sum())
    print(f"{args.file}: ok ({n} material(s))")
    return EXIT_OK


def _cmd_scenario_new(args) -> int:
    from workbench.scenario import starter_text

    _check_outputs([("-o/--output", args.output)], args.force)
    _write_or_print(starter_text(args.kind), args.output, args.force)
    return EXIT_OK


def _cmd_scenario_keys(args) -> int:
    from workbench.scenario import scenario_keys_text

    print(scenario_keys_text(args.kind, args.format), end="")
    return EXIT_OK


def _cmd_scenario_check(args) -> int:
    from workbench.scenario import check_scenario, load_scenario, scenario_hash

    s = load_scenario(args.file)
    check_scenario(s)
    print(
        f"{args.file}: ok ({s.kind}, {len(s.candidates)} candidate(s), "
        f"hash {scenario_hash(s)[:16]})"
    )
    return EXIT_OK


# ---------------------------------------------------------------------------
# Parser
# ---------------------------------------------------------------------------
def build_parser() -> argparse.ArgumentParser:
    """The argument parser (exposed for documentation and tests)."""
    p = argparse.ArgumentParser(
        prog="heatpath",
        description="Compare wall materials and build-ups between hot and cold: reports, "
        "rankings and materials from the command line.",
        epilog="Exit codes: 0 ok, 2 bad input, 1 internal error.",
    )
    p.add_argument("--version", action="version", version=f"heatpath-workbench {_version()}")
    p.add_argument("--debug", action="store_true", help="show tracebacks on errors")
    p.add_argument("-q", "--quiet", action="store_true", help="no progress messages on stderr")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")

    r = sub.add_parser("report", help="write the standalone HTML report of a scenario")
    r.add_argument("scenario", help="scenario file (.toml)")
    r.add_argument("-o", "--output", help="HTML file (default: SCENARIO with .html)")
    r.add_argument("--json", help="also write the results as JSON (SI values)")
    r.add_argument("--csv", help="also write the results table as CSV")
    r.add_argument("--since", help="earlier scenario file: add 'Changes since the previous review'")
    r.add_argument("--tolerance", default="1%",
                   help="with --since: list results that moved by more than this (default 1%%)")
    r.add_argument("--force", action="store_true", help="replace existing output files")
    r.set_defaults(func=_cmd_report)

    k = sub.add_parser("rank", help="rank a scenario's candidates")
    k.add_argument("scenario", help="scenario file (.toml)")
    k.add_argument("--format", choices=("table", "csv", "json"), default="table")
    k.add_argument("--units", choices=("SI", "US"), help="display system (default: scenario's)")
    k.add_argument("-o", "--output", help="output file (default: stdout)")
    k.add_argument("--force", action="store_true", help="replace an existing output file")
    k.set_defaults(func=_cmd_rank)

    df = sub.add_parser("diff", help="what changed between two scenario files")
    df.add_argument("old", help="earlier scenario file (.toml)")
    df.add_argument("new", help="later scenario file (.toml)")
    df.add_argument("--tolerance", default="1%",
                    help="list key results that moved by more than this (default 1%%)")
    df.add_argument("--format", choices=("text", "json"), default="text")
    df.set_defaults(func=_cmd_diff)

    m = sub.add_parser("materials", help="list, show or check materials")
    msub = m.add_subparsers(dest="materials_command", required=True, metavar="ACTION")
    ml = msub.add_parser("list", help="list material ids")
    ml.add_argument("--family", help="only this family (e.g. rigid_foam)")
    ml.add_argument("--file", help="a user materials CSV merged over the curated tables")
    ml.add_argument("--units", choices=("SI", "US"), default="SI")
    ml.set_defaults(func=_cmd_materials_list)
    ms = msub.add_parser("show", help="show one material with the source of every value")
    ms.add_argument("id")
    ms.add_argument("--file", help="a user materials CSV merged over the curated tables")
    ms.add_argument("--units", choices=("SI", "US"), default="SI")
    ms.set_defaults(func=_cmd_materials_show)
    mc = msub.add_parser("check", help="check a user materials CSV; print file:row:column: why")
    mc.add_argument("file")
    mc.set_defaults(func=_cmd_materials_check)

    s = sub.add_parser("scenario", help="start or check a scenario file")
    ssub = s.add_subparsers(dest="scenario_command", required=True, metavar="ACTION")
    sn = ssub.add_parser("new", help="write a commented starter scenario")
    sn.add_argument("kind", help="job kind: wall, shipper or housing")
    sn.add_argument("-o", "--output", help="file to write (default: stdout)")
    sn.add_argument("--force", action="store_true", help="replace an existing file")
    sn.set_defaults(func=_cmd_scenario_new)
    sk = ssub.add_parser("keys", help="list every key a scenario file of a kind may hold")
    sk.add_argument("kind", help="job kind, e.g. wall, shipper or housing")
    sk.add_argument("--format", choices=("text", "markdown"), default="text")
    sk.set_defaults(func=_cmd_scenario_keys)
    sc = ssub.add_parser("check", help="load a scenario and report problems with key and line")
    sc.add_argument("file")
    sc.set_defaults(func=_cmd_scenario_check)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 ok, 2 bad input, 1 internal error)."""
    parser = build_parser()
    args = parser.parse_args(argv)
    from workbench.materials import MaterialsFileError
    from workbench.scenario import ScenarioError
    from workbench.units import UnitError

    bad_input = (
        ScenarioError,
        UnitError,
        MaterialsFileError,
        ValueError,
        FileNotFoundError,
        FileExistsError,
        IsADirectoryError,
        NotADirectoryError,
        PermissionError,
    )
    try:
        return int(args.func(args))
    except bad_input as exc:
        if args.debug:
            traceback.print_exc()
        print(f"heatpath: error: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("heatpath: interrupted", file=sys.stderr)
        return 130
    except MemoryError:
        if args.debug:
            traceback.print_exc()
        print(
            "heatpath: error: not enough memory for this study; coarsen it (fewer candidates or "
            "thicknesses, a coarser time_step, a shorter duration) or lower the [limits] of the "
            "scenario file",
            file=sys.stderr,
        )
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_OK
    except Exception as exc:  # an internal error: say so, without a traceback unless --debug
        if args.debug:
            traceback.print_exc()
        print(
            f"heatpath: internal error: {type(exc).__name__}: {exc}\n"
            "heatpath: run again with --debug for the traceback, and please report it",
            file=sys.stderr,
        )
        return EXIT_INTERNAL


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
