"""Boardside field app: Flet screens over the job store, its exports and sync, and the calculation core."""
