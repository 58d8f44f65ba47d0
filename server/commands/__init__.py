"""One module per command: each adds its own parser with `register` and runs with `run`."""

from . import check, evaluate, models, review, serve, suggest, train, vocab

# In the order `cognomen --help` lists them.
COMMANDS = (train, check, suggest, models, vocab, serve, review, evaluate)
