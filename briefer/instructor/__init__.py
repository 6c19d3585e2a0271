"""The instructor's feature: practice scenarios and decks.

- `scenario_format`: the scenario file (a situation, a METAR-style report, an emphasis), loaded
  into a request and briefed;
- `generation`: reproducible scenarios from a seed, each checked to exercise its emphasis;
- `deck`: N scenarios from one seed, with the student's and the answer's text.

The deck's PDF pages are drawn by `briefer.render.deck_pdf`, which reads what the deck built.
"""
