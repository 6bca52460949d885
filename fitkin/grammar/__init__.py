"""The ``fitkin`` argument grammar: one parser per sub-command, grouped by what they work on.

Only arguments are declared here; ``fitkin.cli`` runs them and ``fitkin.commands`` does the work.
"""
from __future__ import annotations

import argparse

from .. import __version__
from . import inversion, pairs, single_gas, workflows

__all__ = ["build_parser", "subcommand_parser"]


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="fitkin",
        description="Fit intermolecular-potential parameters (Lennard-Jones σ and ε/k, ...) to measured "
                    "dilute-gas viscosity and thermal conductivity, by inverting Chapman–Enskog theory.")
    parser.add_argument("--version", action="version", version=f"fitkin {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for add in (single_gas.add_check, single_gas.add_fit, single_gas.add_predict, single_gas.add_report,
                pairs.add_mix, inversion.add_invert, workflows.add_plan, workflows.add_batch, workflows.add_library, single_gas.add_demo):
        add(sub)
    return parser


def subcommand_parser(name: str) -> argparse.ArgumentParser:
    """The argument parser of one sub-command (e.g. "fit"), as ``fitkin NAME`` uses it."""
    actions = [a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction)]
    return actions[0].choices[name]
