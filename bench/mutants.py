"""A short mutation pass: one-token mutants of score/, stress/ and derive/, and who kills them.

Each mutant changes one operator, comparison, boolean, ``min``/``max`` or
number on one line of product code (comments and strings are never touched),
in a copy of the repository made for the pass; the working tree is left alone.
The package's own tests (``tests/score`` for ``ranker/score``, and so on) then
run against the copy with ``-x``: a failing run kills the mutant, a passing
run lets it survive. Survivors are listed with their file, line and change, as
places where a test is missing or the change is equivalent.

Run (about 10 to 20 minutes on two cores)::

    python bench/mutants.py                 # 40 mutants, seed 1
    python bench/mutants.py --count 60 --seed 7

The figure is the killed share; the list of survivors is the useful part.
"""

from __future__ import annotations

import argparse
import io
import os
import random
import shutil
import subprocess
import sys
import tempfile
import time
import tokenize
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
PACKAGES = ("score", "stress", "derive")

#: Token to its mutant (both ways where it makes sense).
SWAPS = {
    "+": "-",
    "-": "+",
    "*": "/",
    "/": "*",
    "<": "<=",
    "<=": "<",
    ">": ">=",
    ">=": ">",
    "==": "!=",
    "!=": "==",
    "and": "or",
    "or": "and",
    "True": "False",
    "False": "True",
    "min": "max",
    "max": "min",
}


@dataclass(frozen=True)
class Mutant:
    """One token of one line replaced."""

    path: str  # relative to the repository
    line: int  # 1-based
    col: int  # 0-based start of the token
    old: str
    new: str

    def describe(self) -> str:
        return f"{self.path}:{self.line}: {self.old!r} -> {self.new!r}"


def _number_mutant(text: str) -> str | None:
    try:
        value = int(text)
    except ValueError:
        try:
            value = float(text)
        except ValueError:
            return None
        return repr(value * 2.0 if value else 1.0)
    return str(value + 1)


def candidates(path: Path) -> list[Mutant]:
    """Every one-token mutant of ``path`` outside docstrings, comments and imports."""
    rel = str(path.relative_to(ROOT))
    source = path.read_text(encoding="utf-8")
    lines = source.splitlines()
    out = []
    previous = None
    for tok in tokenize.generate_tokens(io.StringIO(source).readline):
        before, previous = previous, tok
        # ``*`` or ``/`` right after ``(`` or ``,`` marks arguments (``*args``, ``*, key``,
        # ``/``), not arithmetic: such a mutant would only move a parameter's kind.
        if tok.string in ("*", "/") and before is not None and before.string in ("(", ","):
            continue
        row, col = tok.start
        if row > len(lines):  # the end-of-file tokens
            continue
        code = lines[row - 1].lstrip()
        if code.startswith(("import ", "from ", "@", "def ", "class ", "raise ", "assert ")):
            continue
        if tok.type == tokenize.OP and tok.string in SWAPS:
            new = SWAPS[tok.string]
        elif tok.type == tokenize.NAME and tok.string in SWAPS:
            new = SWAPS[tok.string]
        elif tok.type == tokenize.NUMBER:
            new = _number_mutant(tok.string)
        else:
            continue
        if new is None or tok.start[0] != tok.end[0]:
            continue
        out.append(Mutant(rel, row, col, tok.string, new))
    return out


def apply(mutant: Mutant, tree: Path) -> bool:
    """Write the mutant into the copy at ``tree``; False when it no longer compiles."""
    target = tree / mutant.path
    lines = (ROOT / mutant.path).read_text(encoding="utf-8").splitlines(keepends=True)
    text = lines[mutant.line - 1]
    end = mutant.col + len(mutant.old)
    lines[mutant.line - 1] = text[: mutant.col] + mutant.new + text[end:]
    source = "".join(lines)
    try:
        compile(source, str(target), "exec")
    except SyntaxError:
        return False
    target.write_text(source, encoding="utf-8")
    return True


def restore(mutant: Mutant, tree: Path) -> None:
    shutil.copyfile(ROOT / mutant.path, tree / mutant.path)


def run_tests(tree: Path, package: str, timeout: float) -> str:
    """Return ``killed``, ``survived`` or ``timeout`` for the copy at ``tree``."""
    env = {**os.environ, "PYTHONPATH": str(tree), "PYTHONDONTWRITEBYTECODE": "1"}
    cmd = [sys.executable, "-m", "pytest", "-x", "-q", "-p", "no:cacheprovider"]
    cmd += ["-p", "no:randomly", f"tests/{package}"]
    try:
        proc = subprocess.run(cmd, cwd=tree, env=env, capture_output=True, timeout=timeout)
    except subprocess.TimeoutExpired:
        return "timeout"
    return "survived" if proc.returncode == 0 else "killed"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--count", type=int, default=40, help="mutants in all (default 40)")
    parser.add_argument("--seed", type=int, default=1, help="choice of mutants (default 1)")
    parser.add_argument("--timeout", type=float, default=300.0, help="seconds per mutant")
    args = parser.parse_args(argv)

    rng = random.Random(args.seed)
    per_package = {p: [] for p in PACKAGES}
    for p in PACKAGES:
        for path in sorted((ROOT / "ranker" / p).glob("*.py")):
            if path.name != "__init__.py":
                per_package[p].extend(candidates(path))
    chosen: list[tuple[str, Mutant]] = []
    for i, p in enumerate(PACKAGES):
        share = args.count // len(PACKAGES) + (1 if i < args.count % len(PACKAGES) else 0)
        chosen += [(p, m) for m in rng.sample(per_package[p], share)]

    with tempfile.TemporaryDirectory(prefix="ranker-mutants-") as tmp:
        tree = Path(tmp)
        for name in ("ranker", "tests", "templates", "docs", "pyproject.toml"):
            src = ROOT / name
            if src.is_dir():
                shutil.copytree(src, tree / name, ignore=shutil.ignore_patterns("__pycache__"))
            else:
                shutil.copyfile(src, tree / name)
        # The installed package maps ranker.templates to the top-level templates/.
        shutil.copytree(ROOT / "templates", tree / "ranker" / "templates", dirs_exist_ok=True)
        tally = {"killed": 0, "survived": 0, "timeout": 0, "does not compile": 0}
        survivors = []
        t0 = time.perf_counter()
        for package, m in chosen:
            if not apply(m, tree):
                tally["does not compile"] += 1
                continue
            verdict = run_tests(tree, package, args.timeout)
            restore(m, tree)
            tally[verdict] += 1
            print(f"{verdict:9s} {m.describe()}", flush=True)
            if verdict == "survived":
                survivors.append(m)
        tested = tally["killed"] + tally["survived"] + tally["timeout"]
        print()
        print(
            f"{tally['killed'] + tally['timeout']} of {tested} mutants killed "
            f"({tally['timeout']} by timeout), {tally['survived']} survived, "
            f"{tally['does not compile']} did not compile; seed {args.seed}, "
            f"{time.perf_counter() - t0:.0f} s"
        )
        for m in survivors:
            print(f"  survived: {m.describe()}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
