"""Every option the command line advertises is exercised by some test (common practice: an
option nobody runs is an option that breaks unseen).  The check is textual: the option string,
quoted, appears in a test file beside the name of its sub-command."""
import argparse
import re
from pathlib import Path

from fitkin.grammar import build_parser

TESTS = Path(__file__).parent


def _advertised():
    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    for name, sp in sub.choices.items():
        for action in sp._actions:
            for option in action.option_strings:
                if option not in ("-h", "--help"):
                    yield name, option


def test_every_advertised_option_is_run_by_a_test():
    texts = [p.read_text(encoding="utf-8") for p in TESTS.glob("test_*.py")]
    advertised = list(_advertised())
    assert len(advertised) > 50            # the walk found the sub-commands' options
    missing = []
    for name, option in advertised:
        quoted = re.compile(r"[\"']" + re.escape(option) + r"[\"'=]")
        command = re.compile(r"[\"']" + re.escape(name) + r"[\"']")
        if not any(quoted.search(t) and command.search(t) for t in texts):
            missing.append(f"{name} {option}")
    assert not missing, "options no test runs: " + ", ".join(missing)
