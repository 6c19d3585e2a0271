"""Forms in the app: enter an aircraft profile or an airfield and its approaches from the flight
manual and the chart, field by field, and save them as data files in the user's folders.

The forms read and check nothing themselves: the text typed in a field is turned into the value
the file format holds (`briefer.tui.forms.values`), the mapping of the whole form is read by the
loader's own model readers (`briefer.tui.forms.check`), and the loader's messages are shown beside
the fields. Only the Textual screen (`briefer.tui.forms.screen`) imports Textual.
"""
