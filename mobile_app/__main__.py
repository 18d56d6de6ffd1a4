"""`python -m mobile_app`: serve the app, or run one of the store's commands."""

from mobile_app.cli import main

if __name__ == "__main__":
    raise SystemExit(main())
