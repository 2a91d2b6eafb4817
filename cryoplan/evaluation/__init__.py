"""Plan -> Results: the evaluation chain (see :func:`cryoplan.evaluation.chain.evaluate`)."""

from .chain import Results, evaluate

__all__ = ["Results", "evaluate"]
