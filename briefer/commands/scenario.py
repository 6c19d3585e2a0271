"""`briefer scenario`: practice scenarios for instructors (new, show, deck)."""

from __future__ import annotations

import argparse
import sys
from typing import Any

from briefer.vocabulary import EMPHASES

NAME = "scenario"
ORDER = 40
HELP = "practice scenarios: generate one (new), brief one from a file (show), print a deck (deck)"
DESCRIPTION = (HELP + ". Scenarios are reproducible from their seed; every number in them is invented "
               "practice data, not for navigation.")



def _seed(text: str) -> int:
    try:
        value = int(text, 10)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    from briefer.vocabulary import SEED_MAX, SEED_WORDS

    if not 0 <= value <= SEED_MAX:
        raise argparse.ArgumentTypeError(f"expected {SEED_WORDS}, got {text}")
    return value


def _count(text: str) -> int:
    try:
        value = int(text, 10)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    from briefer.vocabulary import DECK_SIZE_MAX, DECK_SIZE_WORDS

    if not 1 <= value <= DECK_SIZE_MAX:
        raise argparse.ArgumentTypeError(f"expected {DECK_SIZE_WORDS}, got {value}")
    return value


def _dirs(p: argparse.ArgumentParser) -> None:
    from briefer.commands._common import existing_folder

    p.add_argument("--profile-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                   help="also look for profiles here (repeatable)")
    p.add_argument("--airfield-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                   help="also look for airfields here (repeatable)")


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import add_json_flag, non_empty

    sub = parser.add_subparsers(dest="action", metavar="ACTION", parser_class=type(parser))
    new = sub.add_parser("new", help="generate a scenario that exercises an emphasis",
                         description="Generate a plausible practice scenario that exercises the chosen emphasis, "
                         "write it atomically (--out) and print its brief. The same inputs and seed give the "
                         "same scenario.")
    new.add_argument("--airfield", required=True, metavar="FILE|NAME", help="airfield (a YAML file, ident or name)")
    new.add_argument("--profile", required=True, metavar="FILE|NAME", help="aircraft profile (a YAML file or name)")
    new.add_argument("--approach", metavar="NAME", help="only this approach (default: drawn)")
    new.add_argument("--runway", metavar="DES", help="only this landing runway (default: drawn)")
    new.add_argument("--configuration", metavar="NAME", help="configuration (default: the profile's)")
    new.add_argument("--emphasis", choices=EMPHASES, help="what to exercise (default: drawn from the seed)")
    new.add_argument("--seed", type=_seed, metavar="N", help="seed (default: a fresh one, printed)")
    new.add_argument("--out", type=non_empty, metavar="FILE", help="write the scenario here (YAML); without it the YAML is printed")
    new.add_argument("--force", action="store_true", help="overwrite an existing file")
    _dirs(new)
    add_json_flag(new)

    show = sub.add_parser("show", help="brief a scenario file",
                          description="Load a scenario file (errors name file, line and field) and print its "
                          "student page and brief.")
    show.add_argument("file", metavar="FILE", help="a scenario YAML file")
    _dirs(show)
    add_json_flag(show)

    deck = sub.add_parser("deck", help="a PDF deck: per scenario a student page and an answer page",
                          description="Generate N varied scenarios and print them as one PDF: per scenario a "
                          "student page (the situation, the weather report, what to brief) and an answer page "
                          "(the brief's numbers, the plan view, the sight-picture trap, grading tolerances). "
                          "The same seed gives the same file, byte for byte.")
    deck.add_argument("--count", type=_count, required=True, metavar="N", help="how many scenarios (1 to 50)")
    deck.add_argument("--airfield", action="append", metavar="FILE|NAME",
                      help="airfield to draw from (repeatable; default: every airfield found)")
    deck.add_argument("--profile", action="append", metavar="FILE|NAME",
                      help="profile to draw from (repeatable; default: every profile found)")
    deck.add_argument("--emphasis", action="append", choices=EMPHASES,
                      help="emphasis to draw from (repeatable; default: all)")
    deck.add_argument("--seed", type=_seed, metavar="N", help="seed of the whole deck (default: a fresh one, printed)")
    deck.add_argument("--out", type=non_empty, required=True, metavar="FILE", help="the PDF to write")
    deck.add_argument("--page", choices=("half-letter", "a5", "letter", "a4"), default="letter",
                      help="page size (default letter)")
    deck.add_argument("--force", action="store_true", help="overwrite an existing file")
    _dirs(deck)
    add_json_flag(deck)


def run(args: argparse.Namespace) -> int:
    if args.action is None:
        from briefer.errors import DomainError

        raise DomainError("missing ACTION: new, show or deck (see 'briefer scenario --help')")
    return {"new": _new, "show": _show, "deck": _deck}[args.action](args)


def _print_case(generated_or_loaded: Any, brief: Any, *, checks: tuple[str, ...] = ()) -> None:
    from rich.console import Console

    from briefer.cautions import SHORT_CAUTION
    from briefer.instructor.deck import student_text
    from briefer.render.views import BriefView

    console = Console()
    console.print(student_text(generated_or_loaded.scenario, brief), highlight=False)
    if checks:
        console.rule("Why this case exercises its emphasis")
        for c in checks:
            console.print(f"- {c}", highlight=False)
    console.rule("The brief (answer)")
    console.print(BriefView(brief))
    console.print(f"[dim]{SHORT_CAUTION}[/dim]")


def _new(args: argparse.Namespace) -> int:
    import os
    from pathlib import Path

    from briefer.io import catalog
    from briefer.instructor.generation import generate_scenario, new_seed
    from briefer.instructor.scenario_format import reference_for, scenario_yaml, write_scenario

    if args.out and not args.force and os.path.lexists(args.out):
        from briefer.io.atomic import FileWriteError

        raise FileWriteError(args.out, "the file already exists (not overwritten; overwrite it with --force)")
    airfield = catalog.find_airfield(args.airfield, dirs=args.airfield_dir)
    profile = catalog.find_profile(args.profile, dirs=args.profile_dir)
    seed = args.seed if args.seed is not None else new_seed()
    out_dir = Path(args.out).parent if args.out else Path.cwd()
    gen = generate_scenario(airfield=airfield, profile=profile, emphasis=args.emphasis, seed=seed,
                            approach=args.approach, runway=args.runway, configuration=args.configuration,
                            airfield_ref=reference_for(args.airfield, out_dir, name=airfield.ident),
                            profile_ref=reference_for(args.profile, out_dir, name=profile.name))
    written = None
    if args.out:
        written = str(write_scenario(args.out, gen.scenario, overwrite=args.force))
    if args.json:
        from briefer.commands._common import dumps
        from briefer.render.brief_json import brief_to_dict

        sys.stdout.write(dumps({"seed": seed, "written_to": written, "scenario": gen.scenario.to_mapping(),
                                "checks": list(gen.checks), "brief": brief_to_dict(gen.brief)}) + "\n")
        return 0
    if written:
        print(f"scenario written to {written} (seed {seed}; 'briefer scenario show {written}' briefs it again)")
    else:
        print(scenario_yaml(gen.scenario))
    _print_case(gen, gen.brief, checks=gen.checks)
    return 0


def _show(args: argparse.Namespace) -> int:
    from briefer.instructor.scenario_format import load_scenario

    loaded = load_scenario(args.file, profile_dirs=args.profile_dir, airfield_dirs=args.airfield_dir)
    brief = loaded.brief()
    if args.json:
        from briefer.commands._common import dumps
        from briefer.render.brief_json import brief_to_dict

        sys.stdout.write(dumps({"scenario": loaded.scenario.to_mapping(), "brief": brief_to_dict(brief)}) + "\n")
        return 0
    _print_case(loaded, brief)
    return 0


def _deck(args: argparse.Namespace) -> int:
    from briefer.instructor.deck import build_deck
    from briefer.render.deck_pdf import check_deck_target, write_deck
    from briefer.instructor.generation import new_seed

    check_deck_target(args.out, page=args.page, overwrite=args.force)   # before the work
    seed = args.seed if args.seed is not None else new_seed()
    deck = build_deck(count=args.count, airfields=args.airfield, profiles=args.profile, emphases=args.emphasis,
                      seed=seed, profile_dirs=args.profile_dir, airfield_dirs=args.airfield_dir)
    path = write_deck(args.out, deck, page=args.page, overwrite=args.force)
    if args.json:
        from briefer.commands._common import dumps

        sys.stdout.write(dumps({"seed": seed, "written_to": str(path), "count": len(deck.cases),
                                "scenarios": [c.scenario.to_mapping() for c in deck.cases],
                                "skipped": list(deck.skipped)}) + "\n")
        return 0
    print(f"deck of {len(deck.cases)} scenarios written to {path} (seed {seed}; the same seed gives the same file)")
    for i, c in enumerate(deck.cases, 1):
        print(f"  {i:2d}. {c.scenario.title} (seed {c.scenario.seed})")
    from briefer.cautions import SHORT_CAUTION

    print(SHORT_CAUTION)
    return 0
