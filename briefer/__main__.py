"""`python -m briefer`."""

from briefer.cli import run

run()
