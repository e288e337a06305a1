"""One module per subcommand; each exposes ``register(subparsers)``.

To add a subcommand, write a module here and add its name to :data:`COMMANDS`.
"""

COMMANDS = ("solve", "demo", "tables", "target", "buffer", "sweep", "batch", "diagram")
