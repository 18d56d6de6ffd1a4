"""Reusable Flet widgets of the field app: thin, no arithmetic, no SQL."""
