"""revamp: heat-exchanger revamp studies."""
__version__ = "0.1.0"
