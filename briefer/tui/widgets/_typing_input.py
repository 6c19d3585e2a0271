"""An Input whose editing keys take effect in the order they are typed."""

from __future__ import annotations

from textual import events
from textual.binding import Binding
from textual.widgets import Input

FOCUS_KEYS = [
    Binding("tab", "app.focus_next", "Next field", show=False, priority=True),
    Binding("shift+tab", "app.focus_previous", "Previous field", show=False, priority=True),
]
"""Tab and shift+Tab as a screen's priority bindings: the focus moves when the key arrives, before
the keys typed after it are handed out (as a plain binding Tab took effect only after passing up
to the app, so characters typed right after it went into the field being left)."""


class TypingInput(Input):
    """`Input`, with its own editing keys (backspace, delete, arrows, home/end, ctrl+u ...)
    applied as it receives them, in order with the characters typed.

    Textual applies a widget's (non-priority) key bindings only after the key has travelled up
    through every container to the app, while a character is inserted as soon as the input
    receives it. Keys that arrive together (a fast typist, a paste of keys, a slow SSH link)
    were applied out of order: ``End ctrl+U 310/20`` typed into '240/10G16' left '10/20'.
    """

    async def _on_key(self, event: events.Key) -> None:
        for binding in self._bindings.key_to_bindings.get(event.key, ()):
            if not binding.priority and await self.app.run_action(binding.action, self):
                event.stop()
                event.prevent_default()
                return
        await super()._on_key(event)
