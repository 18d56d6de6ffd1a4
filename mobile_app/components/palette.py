"""Boardside's colours and themes: a petrol brand colour, strong-contrast verdict badges."""

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


def app_theme() -> ft.Theme:
    """The theme (light and dark alike) seeded from the brand colour."""
    return ft.Theme(color_scheme_seed=BRAND, use_material3=True)


def theme_mode(setting: str) -> ft.ThemeMode:
    """The page theme mode for the `theme` setting."""
    return {"light": ft.ThemeMode.LIGHT, "dark": ft.ThemeMode.DARK}.get(setting, ft.ThemeMode.SYSTEM)
