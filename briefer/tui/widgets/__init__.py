"""The app's widgets, one per module."""

from briefer.tui.widgets._choice_list import Choice, ChoiceList
from briefer.tui.widgets._envelope_polar import EnvelopePolar
from briefer.tui.widgets._field_row import FieldRow
from briefer.tui.widgets._plan_canvas import PlanCanvas
from briefer.tui.widgets._side_view import SideView
from briefer.tui.widgets._typing_input import TypingInput

__all__ = ["Choice", "ChoiceList", "EnvelopePolar", "FieldRow", "PlanCanvas", "SideView", "TypingInput"]
