"""``python -m plaforge``: the same command line as the ``plaforge`` script."""

from .cli import main

if __name__ == "__main__":
    main()
