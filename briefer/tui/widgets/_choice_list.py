"""A list of named choices; the highlighted one is the choice (marked ● , not by colour alone)."""

from __future__ import annotations

from briefer._dataclass import dataclass

from rich.text import Text
from textual import on
from textual.message import Message
from textual.widgets import OptionList
from textual.widgets.option_list import Option

CHOSEN, OTHER, BROKEN = "● ", "○ ", "✗ "


@dataclass(frozen=True, slots=True)
class Choice:
    """One entry: `value` is what the inputs store, `label` what the crew reads; `error` marks
    an entry that cannot be chosen (a broken file) and says why."""

    value: str
    label: str
    error: str | None = None


class ChoiceList(OptionList):
    """Pick one of a few named things with arrows, Enter or the mouse."""

    class Changed(Message):
        """The crew chose another entry.

        Attributes:
            choice_list: The list that changed.
            value: The chosen entry's value.
        """

        def __init__(self, choice_list: ChoiceList, value: str) -> None:
            super().__init__()
            self.choice_list = choice_list
            self.value = value

        @property
        def control(self) -> ChoiceList:
            return self.choice_list

    def __init__(self, *, id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self.choices: tuple[Choice, ...] = ()
        self.chosen: str | None = None

    def _prompt(self, c: Choice) -> Text:
        if c.error is not None:
            return Text(BROKEN + c.label + " (broken file)", style="strike")
        return Text((CHOSEN if c.value == self.chosen else OTHER) + c.label,
                    style="bold" if c.value == self.chosen else "")

    def set_choices(self, choices: list[Choice] | tuple[Choice, ...], chosen: str | None) -> None:
        """Show these entries with `chosen` marked (posts no Changed)."""
        choices = tuple(choices)
        if choices == self.choices and chosen == self.chosen:
            return
        self.choices, self.chosen = choices, chosen
        self.set_options(Option(self._prompt(c), id=f"c{i}", disabled=c.error is not None)
                         for i, c in enumerate(choices))
        index = next((i for i, c in enumerate(choices) if c.value == chosen), None)
        if index is not None:
            self.highlighted = index

    def _refresh_marks(self) -> None:
        for i, c in enumerate(self.choices):
            self.replace_option_prompt_at_index(i, self._prompt(c))

    @on(OptionList.OptionHighlighted)
    def _highlighted(self, event: OptionList.OptionHighlighted) -> None:
        event.stop()
        index = event.option_index
        if not 0 <= index < len(self.choices):
            return
        value = self.choices[index].value
        if value != self.chosen:
            self.chosen = value
            self._refresh_marks()
            self.post_message(self.Changed(self, value))

    @on(OptionList.OptionSelected)
    def _selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
