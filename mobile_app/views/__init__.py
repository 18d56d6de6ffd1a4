"""Screens of the field app, one per module, each with `build(shell, *route_parts) -> ft.View`."""
