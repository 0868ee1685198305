"""The command line: the only place that prints for the user.

| module | what it holds |
|---|---|
| ``main`` | argparse front end, one handler per command, exit codes |
| ``sweep`` | ``shaftsys sweep`` (design studies) |
| ``terminal`` | colour on terminals only |
| ``progress`` | progress bars on terminals only |
"""

from shaftsys.cli.main import EXIT_CODES_TEXT, _parser, main, starter_model_text

__all__ = ["EXIT_CODES_TEXT", "_parser", "main", "starter_model_text"]
