"""Pure computation: no I/O, no UI imports. Units live in identifiers."""
