"""Boardside's colours, themes and fonts: a petrol brand colour, strong-contrast verdict badges, and a
fallback font for the characters the web client's Roboto lacks (→ among them)."""

from __future__ import annotations

import flet as ft

BRAND = "#0E5A6B"

TONES: dict[str, tuple[str, str]] = {
    "good": ("#1B5E20", "#FFFFFF"),
    "bad": ("#B3141B", "#FFFFFF"),
    "unknown": ("#4A4F57", "#FFFFFF"),
    "warn": ("#7A4F00", "#FFFFFF"),
    "neutral": ("#0E5A6B", "#FFFFFF"),
}
"""Badge background and text per verdict tone: white on dark colours reads in both themes."""


def tone(name: str) -> tuple[str, str]:
    """Background and foreground colour of a tone."""
    return TONES.get(name, TONES["unknown"])


FALLBACK_FONT = "DejaVu Sans"
FONTS: dict[str, str] = {FALLBACK_FONT: "fonts/DejaVuSans.ttf"}
"""Fonts the page registers (`page.fonts`), served from assets/: DejaVu Sans (its licence beside it)
draws what Roboto, the web client's only font, has no glyph for."""
TEXT_STYLES = (
    "display_large", "display_medium", "display_small", "headline_large", "headline_medium",
    "headline_small", "title_large", "title_medium", "title_small", "body_large", "body_medium",
    "body_small", "label_large", "label_medium", "label_small",
)


BASE_FONT = "Roboto"
"""The web client's own font (bundled with it), named so that the fallback stays behind it."""


def _text_theme() -> ft.TextTheme:
    """Every text style of the theme in Roboto with the fallback font behind it."""
    return ft.TextTheme(**{name: ft.TextStyle(font_family=BASE_FONT, font_family_fallback=[FALLBACK_FONT])
                           for name in TEXT_STYLES})


def app_theme() -> ft.Theme:
    """The theme (light and dark alike) seeded from the brand colour, the fallback font behind every
    text style."""
    return ft.Theme(color_scheme_seed=BRAND, use_material3=True, text_theme=_text_theme(),
                    primary_text_theme=_text_theme())


def theme_mode(setting: str) -> ft.ThemeMode:
    """The page theme mode for the `theme` setting."""
    return {"light": ft.ThemeMode.LIGHT, "dark": ft.ThemeMode.DARK}.get(setting, ft.ThemeMode.SYSTEM)
