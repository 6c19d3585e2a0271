"""`briefer new-airfield`: print (or write) a commented skeleton to type an airfield from its charts."""

from __future__ import annotations

import argparse

NAME = "new-airfield"
HELP = "print a commented airfield skeleton to fill in from the approach chart and airport diagram"
DESCRIPTION = (HELP + ". No coordinates needed: runways by heading and length, fixes and obstacles by "
               "distance and bearing. Fill it in, then run 'briefer check FILE'.")
ORDER = 91


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--out", metavar="FILE", help="write the skeleton to FILE instead of printing it")
    parser.add_argument("--force", action="store_true", help="overwrite an existing FILE")


def run(args: argparse.Namespace) -> int:
    from briefer.io.skeleton import AIRFIELD_SKELETON

    if not args.out:
        print(AIRFIELD_SKELETON, end="")
        return 0
    from briefer.io.atomic import write_text_atomic

    path = write_text_atomic(args.out, AIRFIELD_SKELETON, overwrite=args.force)
    print(f"wrote {path}: fill in the empty values, then run: briefer check {args.out}")
    return 0
