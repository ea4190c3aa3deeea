"""How strong the tests of one rule module are: a small mutation run (a measurement, not a test).

Each mutant changes one thing in the module's source (a comparison's direction or strictness,
an arithmetic operator, a numeric constant, a boolean constant), the given tests are run against
it, and the mutant is *killed* when they fail. The score is killed / mutants. A surviving mutant
is a place where the tests would not notice a wrong rule: the list printed at the end says where.

Run it in a scratch clone with the project installed editable, never in your working tree (it
rewrites the module while it runs and puts it back at the end):

    python benchmarks/mutation_score.py rules/motor/cooling.py tests/test_rule_motor.py
"""

from __future__ import annotations

import argparse
import ast
import subprocess
import sys
import time
from pathlib import Path

SWAP_COMPARE = {
    ast.Lt: ast.LtE,
    ast.LtE: ast.Lt,
    ast.Gt: ast.GtE,
    ast.GtE: ast.Gt,
    ast.Eq: ast.NotEq,
    ast.NotEq: ast.Eq,
}
SWAP_BINOP = {ast.Add: ast.Sub, ast.Sub: ast.Add, ast.Mult: ast.Div, ast.Div: ast.Mult}


def mutation_points(tree: ast.AST) -> list[tuple[int, str]]:
    """(index in ast.walk order, description) of every node a mutant may change; docstrings
    and type annotations are left alone."""
    points = []
    for index, node in enumerate(ast.walk(tree)):
        if isinstance(node, ast.Compare) and type(node.ops[0]) in SWAP_COMPARE:
            points.append((index, f"line {node.lineno}: comparison"))
        elif isinstance(node, ast.BinOp) and type(node.op) in SWAP_BINOP:
            points.append((index, f"line {node.lineno}: arithmetic"))
        elif isinstance(node, ast.Constant) and type(node.value) in (int, float, bool):
            points.append((index, f"line {node.lineno}: constant {node.value!r}"))
    return points


def mutate(source: str, target: int) -> str | None:
    tree = ast.parse(source)
    for index, node in enumerate(ast.walk(tree)):
        if index != target:
            continue
        if isinstance(node, ast.Compare):
            node.ops[0] = SWAP_COMPARE[type(node.ops[0])]()
        elif isinstance(node, ast.BinOp):
            node.op = SWAP_BINOP[type(node.op)]()
        elif isinstance(node, ast.Constant):
            value = node.value
            if isinstance(value, bool):
                node.value = not value
            elif isinstance(value, int):
                node.value = value + 1
            else:
                node.value = value * 1.5 if value else 1.0
        return ast.unparse(tree)
    return None


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("module", type=Path)
    parser.add_argument("tests", nargs="+")
    parser.add_argument("--limit", type=int, default=0, help="at most this many mutants")
    args = parser.parse_args()
    original = args.module.read_text()
    points = mutation_points(ast.parse(original))
    if args.limit:
        points = points[: args.limit]
    command = [sys.executable, "-m", "pytest", "-x", "-q", "-p", "no:cacheprovider", *args.tests]
    baseline = subprocess.run(command, capture_output=True, timeout=600)
    if baseline.returncode != 0:
        print("the tests fail on the unmutated module: nothing to measure")
        return 2
    killed, survivors, started = 0, [], time.perf_counter()
    try:
        for index, where in points:
            mutant = mutate(original, index)
            if mutant is None:
                continue
            args.module.write_text(mutant)
            try:
                result = subprocess.run(command, capture_output=True, timeout=120)
                dead = result.returncode != 0
            except subprocess.TimeoutExpired:
                dead = True  # a hang is caught too
            killed += dead
            if not dead:
                survivors.append(where)
    finally:
        args.module.write_text(original)
    total = killed + len(survivors)
    seconds = time.perf_counter() - started
    print(f"{args.module}: {killed} of {total} mutants killed ({100 * killed / total:.1f} %)")
    print(f"{seconds:.0f} s; surviving mutants:")
    for where in survivors:
        print(f"  {where}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
