"""Command modules of the command line; each defines ``register(subparsers)``."""
