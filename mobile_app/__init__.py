"""Boardside field app: Flet screens on top of the job records and the calculation core."""
