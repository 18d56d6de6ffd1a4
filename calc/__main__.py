"""`python -m calc`: see calc/cli.py."""

from calc.cli import main

if __name__ == "__main__":
    raise SystemExit(main())
