"""Write docs/input-errors.md from the corpus of broken inputs.

Run from the repository root::

    python -m tests.workbook.make_error_doc

``test_error_doc.py`` checks the file matches :func:`render`, so the page
cannot drift from what the reader says.
"""

from __future__ import annotations

import importlib
import importlib.util
import sys
import tempfile
from pathlib import Path

from ranker.errors import InputError
from ranker.workbook import LIMITS, SHEETS, read_workbook
from ranker.workbook.criteria import JUDGMENT_HIGH, RECIPROCAL_TOLERANCE

from .corpus import CASES

DOC = Path(__file__).resolve().parents[2] / "docs" / "input-errors.md"

_PERCENT = {
    "share": "a fraction of one: `12%` is 0.12",
    "points": "percentage points: `12%` is 12 (a cell formatted as a percentage holding 0.12 "
    "is also 12)",
    "reject": "an error (the field has its own unit)",
}


def _messages() -> list[tuple[str, str, str, list[str]]]:
    out = []
    with tempfile.TemporaryDirectory() as tmp:
        for case in CASES:
            folder = Path(tmp) / case.name
            folder.mkdir()
            try:
                read_workbook(case.builder(folder))
            except InputError as err:
                lines = [str(p) for p in err.problems]
            else:  # pragma: no cover - the corpus test fails first
                lines = ["(no error)"]
            out.append((case.name, case.where, case.builder.__doc__, lines))
    return out


def _hardening():
    """Return tests/hardening's ``cases``, ``hostile`` and ``_cli`` modules.

    They are loaded under the name the test runner gives that package
    (``hardening`` under pytest, ``tests.hardening`` under ``python -m``), so
    there is one copy of each.
    """
    prefix = __package__.rpartition(".")[0] if __package__ else ""
    name = f"{prefix}.hardening" if prefix else "hardening"
    if name not in sys.modules:
        folder = Path(__file__).resolve().parents[1] / "hardening"
        spec = importlib.util.spec_from_file_location(
            name, folder / "__init__.py", submodule_search_locations=[str(folder)]
        )
        package = importlib.util.module_from_spec(spec)
        sys.modules[name] = package
        spec.loader.exec_module(package)
    return tuple(
        importlib.import_module(f"{name}.{m}") for m in ("cases", "hostile", "_cli", "odd")
    )


def end_to_end() -> tuple[list, list]:
    """The end-to-end cases and hostile files whose behaviour is settled (no known bug)."""
    cases, hostile, _, _ = _hardening()
    return [s for s in cases.STAGES if not s.bug], [s for s in hostile.HOSTILE if not s.bug]


def _run_messages(entries) -> list[tuple[str, str, int, list[str], bool]]:
    """Run each entry through ``ranker run``; keep what the planner reads on the terminal."""
    cli = _hardening()[2]
    out = []
    with tempfile.TemporaryDirectory() as tmp:
        for entry in entries:
            folder = Path(tmp) / entry.name
            folder.mkdir()
            (folder / "out").mkdir()
            path, extra = entry.build(folder)
            if "--out" not in extra:
                extra = [*extra, "--out", str(folder / "out")]
            if "--samples" not in extra:
                extra = [*extra, "--samples", "0"]
            outcome = cli.run("run", path, *extra)
            if outcome.code == 2:
                lines = outcome.problems
            else:
                lines = [f"warning: {w}" for w in outcome.warnings if entry.says in w]
            lines = [line.replace(str(folder), "<folder>") for line in lines]
            run_only = bool(getattr(entry, "check_bug", ""))
            out.append((entry.name, entry.about, outcome.code, lines, run_only))
    return out


def _valid_input(folder: Path):
    from .wbfill import valid_sheets, write_book

    return write_book(folder / "input.xlsx", valid_sheets()), []


def _odd_lines() -> list[str]:
    """The policy of each class of odd workbook, then its cases and what each gets."""
    odd = _hardening()[3]
    entries = {e[0]: e for e in _run_messages(odd.ODD)}
    # What the valid input itself says (samples off, an extrapolated adoption path) is left
    # out, so each entry shows what its own oddity makes the tool say.
    base = _run_messages([odd.Odd("valid", 0, "", _valid_input, 0, "", "", 0)])[0][3]
    lines = [
        "## Odd and hostile workbooks, by class",
        "",
        "Each class has one policy; the cases under it (built in `tests/hardening/odd.py` "
        "and run end to end by `tests/hardening/test_odd.py`) show what the planner sees. "
        "A run that succeeds writes a results workbook with no formula or defined name "
        "from the input, and that workbook runs again.",
        "",
    ]
    for klass, (title, policy) in odd.CLASSES.items():
        cases = [c for c in odd.ODD if c.klass == klass]
        lines += [f"### {klass}. {title} ({len(cases)} cases)", "", policy, ""]
        for c in cases:
            name, about, code, msgs, _ = entries[c.name]
            if code == 0:
                msgs = [m for m in msgs if m not in base] or ["(it runs as the valid input does)"]
            lines += _entry_lines(name, about, code, msgs, False)
            if c.check != c.code:
                lines[-5] += " `ranker check` passes it: only the run meets it."
    return lines


def _entry_lines(name: str, about: str, code: int, msgs: list[str], run_only: bool) -> list[str]:
    head = f"- **{about}** (`{name}`)"
    if code == 0:
        head += " Runs (exit 0), saying:"
    if run_only:
        head += " Only `ranker run` reports this so far, not `ranker check`."
    return [head, "", "  ```", *(f"  {m}" for m in msgs), "  ```", ""]


def _group(where: str) -> str:
    sheet = where.split("!")[0]
    return sheet if sheet in SHEETS else "The file"


def render() -> str:
    """Return the text of docs/input-errors.md."""
    mb = 1024**2
    lines = [
        "# Input errors and limits",
        "",
        "<!-- Generated by `python -m tests.workbook.make_error_doc` from "
        "tests/workbook/corpus.py; do not edit by hand. -->",
        "",
        "`ranker check` and `ranker run` read the whole workbook before doing anything else and "
        "list every problem they find, not just the first, one per line, as",
        "",
        "```",
        "Sheet!Cell: what is wrong; how to fix it",
        "```",
        "",
        "and stop with exit code 2. A problem about the file itself names the file instead of a "
        "cell; one about a whole sheet, column or row names `Sheet`, `Sheet!D:D` or "
        "`Sheet!1:1`. The input file is only read, never changed.",
        "",
        "## Limits",
        "",
        "| limit | value |",
        "| --- | --- |",
        f"| file size | {LIMITS.file_bytes // mb} MB |",
        f"| unpacked size of all parts of the .xlsx | {LIMITS.unzipped_bytes // mb} MB |",
        f"| unpacked / stored size of one part (parts over {LIMITS.ratio_from_bytes // mb} MB) "
        f"| {LIMITS.member_ratio:g} |",
        f"| parts in the .xlsx | {LIMITS.members:,} |",
        f"| rows per sheet (header included) | {LIMITS.rows:,} |",
        f"| columns per sheet | {LIMITS.columns} |",
        f"| unpacked size of the shared strings (the text of all cells) "
        f"| {LIMITS.shared_strings_bytes // mb} MB |",
        f"| bytes before the first element of an XML part | {LIMITS.prolog_bytes // mb} MB |",
        f"| Pairwise judgments | 1/9 to {JUDGMENT_HIGH:g}; filled reciprocal pairs agree within "
        f"{RECIPROCAL_TOLERANCE:.0%} |",
        "",
        "The sizes are read from the zip directory before anything is unpacked; then every "
        "part is unpacked once, a chunk at a time, to check it is whole. A part that is "
        "encrypted inside the zip or packed by a method other than stored or deflate is "
        "refused. XML entity declarations (which spreadsheet programs never write) are "
        "refused before the sheets are parsed, in UTF-8 or UTF-16, and the parser itself "
        "(defusedxml) forbids them as well.",
        "",
        "## How cells are read",
        "",
        "- Header keys match in any case, ignoring surrounding spaces; inner spaces count as "
        "`_` and a trailing `[unit]` is ignored (`Length_mi [mi]` is `length_mi`).",
        "- Rows that are entirely blank are skipped. Text is stripped of surrounding spaces.",
        "- Numbers may carry thousands commas (`1,200`), a dollar sign (`$52,000`, `USD 52,000`), "
        "a minus sign or accounting brackets (`(1,200)`). A comma as decimal mark, points "
        "between thousands (`5.200`), a unit typed after the number, another currency, `NaN`, "
        "`inf`, TRUE/FALSE, dates and durations are errors, and so is any number larger than "
        "1e15 in size. A cell formatted as a percentage is an error in a field with a unit of "
        "its own. A year is a plain number (`2,030` is an error). A date in a text field "
        "(an id the spreadsheet turned into a date) is an error.",
        "- yes/no fields take yes, no, y, n, true, false, 1 and 0 in any case.",
        "- A formula is read through the value the spreadsheet program saved with it; a formula "
        "that was never calculated (written by another program) is an error, as is a saved "
        "error value such as `#DIV/0!`.",
        "- Merged cells in the data are an error. Hidden rows, columns and sheets are read, with "
        "a warning. Macro-enabled workbooks (.xlsm) are read; their macros are never run nor "
        "kept, with a warning.",
        "- Metric twins (`length_km`, `climb_m`, `descent_m`, `km`) are converted with "
        "1 mi = 1.609344 km and 1 ft = 0.3048 m; giving a field in both units is an error.",
        "",
        "What a typed percent sign means, by field:",
        "",
        "| sheet | field | unit | `12%` means |",
        "| --- | --- | --- | --- |",
    ]
    for sch in SHEETS.values():
        for f in sch.fields:
            if f.key in ("at_least", "at_most"):
                lines.append(
                    f"| {sch.name} | `{f.key}` | the criterion's | percentage points "
                    "for a [0-100] criterion, an error for a [USD] one, otherwise a "
                    "fraction of one |"
                )
            elif f.kind == "number":
                lines.append(
                    f"| {sch.name} | `{f.key}` | {f.unit or 'own'} | {_PERCENT[f.percent]} |"
                )
    lines += [
        "| Criteria | weight columns | [-] | a fraction of one (points are rescaled anyway) |",
        "| Assumptions, Scenarios | `value` | [-], [1/yr] | a fraction of one |",
        "| Assumptions, Scenarios | `value` | any other | an error |",
        "",
        "## Every kind of bad input and its message",
        "",
        "Each entry is built by code in `tests/workbook/corpus.py` and read by the tests; the "
        "message is exactly what the tool prints.",
    ]
    groups: dict[str, list] = {}
    for entry in _messages():
        groups.setdefault(_group(entry[1]), []).append(entry)
    for group in ["The file", *SHEETS]:
        if group not in groups:
            continue
        lines += ["", f"### {group}", ""]
        for name, _where, about, msgs in groups[group]:
            lines += [f"- **{about}** (`{name}`)", "", "  ```"]
            lines += [f"  {m}" for m in msgs]
            lines += ["  ```", ""]
    stages, hostile = end_to_end()
    lines += [
        "",
        "## What the later stages catch",
        "",
        "These pass the reader; `ranker run` stops at the stage that needs the missing or "
        "inconsistent input, with exit code 2, and writes nothing. Problems with the run's "
        "options name the option. `ranker check` reports the workbook's problems too (it "
        "takes no run options). Each entry is built in `tests/hardening/cases.py` and run end "
        "to end by the tests.",
        "",
    ]
    legal = []
    for entry in _run_messages(stages):
        if entry[2] == 0:
            legal.append(entry)
        else:
            lines += _entry_lines(*entry)
    lines += [
        "## Edge cases that run",
        "",
        "Legal but unusual inputs run to the end (exit code 0) and say what they mean:",
        "",
    ]
    for entry in legal:
        lines += _entry_lines(*entry)
    lines += [
        "## Hostile and foreign files",
        "",
        "Refused before any sheet is read, quickly and in bounded memory (a macro-enabled "
        "workbook is read, without its macros). Each entry is built in "
        "`tests/hardening/hostile.py`.",
        "",
    ]
    for entry in _run_messages(hostile):
        lines += _entry_lines(*entry)
    lines += _odd_lines()
    lines += [
        "## Output files",
        "",
        "- The outputs are written to hidden temporary files in the output folder and moved "
        "into place only when all are complete; when anything fails (a full disk, a "
        "read-only folder, a file held open by another program) the temporary files are "
        "removed and any output already replaced is put back, so the pair is either all new "
        "or as it was.",
        "- An existing file named like an output is replaced only when ranker wrote it (it "
        "carries ranker's marker); otherwise the run stops with exit code 2 and leaves it "
        "as it is, and the other output as well.",
        "- The input's bytes are read once; the results workbook's copy of the input sheets, "
        "the ranking, the justification sheet and the SHA-256 they show all come from those "
        "bytes. The copy carries values only: no formula, defined name, macro or external "
        "link of the input, with a warning saying what was converted or left out.",
        "- An internal error (exit code 1) writes its log to a new file, readable by the user "
        "only, in `$XDG_STATE_HOME/ranker` (default `~/.local/state/ranker`, a folder only "
        "the user can write) and names it. SIGTERM stops a run as Ctrl-C does (exit code "
        "143), leaving no temporary file or backup beside the outputs.",
        "- The input workbook is only read; macros are never copied into the outputs, and text "
        "that a spreadsheet would take for a formula (starting with `=`, `+`, `-`, `@`, a tab "
        "or a carriage return) is written as text.",
    ]
    return "\n".join(lines).rstrip() + "\n"


def main() -> int:
    """Write the page; return 0."""
    DOC.parent.mkdir(parents=True, exist_ok=True)
    DOC.write_text(render(), encoding="utf-8")
    print(f"wrote {DOC}", file=sys.stderr)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
