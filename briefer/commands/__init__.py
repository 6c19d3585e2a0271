"""Sub-commands of the briefer CLI, one module each, found by briefer.cli at start-up."""
