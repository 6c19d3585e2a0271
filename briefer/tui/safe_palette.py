"""The command palette, robust to keys queued before it has laid out its list.

A fast typist (or a pasted key sequence) can send ctrl+p then PageDown before the palette's
option list has been laid out; the list then has options but no line map yet, and Textual's page
move raises ``KeyError: 0``, ending the app. A key that arrives that early is ignored instead.
"""

from __future__ import annotations

from textual.command import CommandPalette


class SafeCommandPalette(CommandPalette):
    """`CommandPalette` whose list keys are ignored until the list can move."""

    def _action_command_list(self, action: str) -> None:
        try:
            super()._action_command_list(action)
        except (KeyError, IndexError):   # the list is still filling: nothing to move yet
            pass
