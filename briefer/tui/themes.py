"""Our own themes: a high-contrast night theme (amber on black, no bright white fields)."""

from __future__ import annotations

from textual.theme import Theme

NIGHT_THEME = Theme(
    name="briefer-night",
    primary="#ffb000",
    secondary="#ffd27f",
    accent="#ffcc00",
    warning="#ffe600",
    error="#ff4040",
    success="#7fff7f",
    foreground="#ffd9a0",
    background="#000000",
    surface="#0c0800",
    panel="#1a1200",
    boost="#ffb000",
    dark=True,
    luminosity_spread=0.1,
    text_alpha=1.0,
    variables={
        "footer-key-foreground": "#ffcc00",
        "input-selection-background": "#ffb000 40%",
        "block-cursor-background": "#ffb000",
        "block-cursor-foreground": "#000000",
        "border": "#ffb000",
        "border-blurred": "#7a5500",
    },
)
"""High contrast for a dark cockpit: amber text on black, bright warnings."""

THEMES = (NIGHT_THEME,)
